/// <reference lib="dom" />
// Pole map as SVG: closed-loop poles (crosses), observer poles (diamonds), zeros (rings);
// equal scaling on both axes; the unit circle for sampled designs, the imaginary axis otherwise.
// SVG presentation attributes only (no style attributes), so a strict Content-Security-Policy holds.
import { formatNumber, type Complex, type PlotData, type PlotTheme } from './types';

const svgNs = 'http://www.w3.org/2000/svg';

function element<K extends keyof SVGElementTagNameMap>(name: K, attributes: Record<string, string | number>): SVGElementTagNameMap[K] {
  const node = document.createElementNS(svgNs, name);
  for (const [key, value] of Object.entries(attributes)) node.setAttribute(key, String(value));
  return node;
}

/** Tick positions at 1, 2 or 5 × 10^k covering [low, high]. */
export function niceTicks(low: number, high: number, count = 6): number[] {
  const span = high - low;
  if (!(span > 0) || !Number.isFinite(span)) return [low];
  const raw = span / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= raw) ?? 10 * power;
  const ticks: number[] = [];
  for (let t = Math.ceil(low / step) * step; t <= high + step * 1e-9; t += step) ticks.push(Math.abs(t) < step * 1e-9 ? 0 : t);
  return ticks;
}

export function drawPoleMap(host: HTMLElement, data: PlotData, theme: PlotTheme, width: number): void {
  const height = Math.round(width * 0.75);
  const margin = { left: 56, right: 12, top: 12, bottom: 40 };
  const groups: { label: string; points: Complex[]; marker: 'cross' | 'diamond' | 'ring'; colour: string }[] = [
    { label: 'closed-loop pole', points: data.closedLoopPoles ?? [], marker: 'cross', colour: theme.palette[0] },
    { label: 'observer pole', points: data.details?.observerPoles ?? [], marker: 'diamond', colour: theme.palette[1] },
    { label: 'zero', points: data.details?.zeros ?? [], marker: 'ring', colour: theme.palette[2] },
  ];
  const all = groups.flatMap((g) => g.points).filter((p) => Number.isFinite(p.re) && Number.isFinite(p.im));
  const discrete = data.domain === 'discrete';

  // Extent: all points, the origin, and the unit circle when sampled; equal units on both axes.
  let [reLow, reHigh, imLow, imHigh] = discrete ? [-1, 1, -1, 1] : [0, 0, 0, 0];
  for (const p of all) {
    reLow = Math.min(reLow, p.re);
    reHigh = Math.max(reHigh, p.re);
    imLow = Math.min(imLow, p.im);
    imHigh = Math.max(imHigh, p.im);
  }
  const plotWidth = width - margin.left - margin.right;
  const plotHeight = height - margin.top - margin.bottom;
  const spanRe = Math.max(reHigh - reLow, 1e-3 * Math.max(1, Math.abs(reLow), Math.abs(reHigh)));
  const spanIm = Math.max(imHigh - imLow, spanRe * 0.25);
  const unitsPerPixel = 1.15 * Math.max(spanRe / plotWidth, spanIm / plotHeight);
  const centreRe = (reLow + reHigh) / 2;
  const centreIm = (imLow + imHigh) / 2;
  const x = (re: number) => margin.left + plotWidth / 2 + (re - centreRe) / unitsPerPixel;
  const y = (im: number) => margin.top + plotHeight / 2 - (im - centreIm) / unitsPerPixel;
  const xRange = [centreRe - (plotWidth / 2) * unitsPerPixel, centreRe + (plotWidth / 2) * unitsPerPixel] as const;
  const yRange = [centreIm - (plotHeight / 2) * unitsPerPixel, centreIm + (plotHeight / 2) * unitsPerPixel] as const;

  const svg = element('svg', { width, height, viewBox: `0 0 ${width} ${height}`, role: 'img', class: 'lw-pole-map' });
  const title = element('title', {});
  title.textContent = `${discrete ? 'z-plane' : 's-plane'} pole map of ${data.name}`;
  svg.append(title);
  const font = { 'font-family': theme.fontFamily, 'font-size': 12, fill: theme.foreground };

  for (const tick of niceTicks(xRange[0], xRange[1])) {
    svg.append(element('line', { x1: x(tick), x2: x(tick), y1: margin.top, y2: margin.top + plotHeight, stroke: theme.grid, 'stroke-width': 1 }));
    const label = element('text', { ...font, x: x(tick), y: margin.top + plotHeight + 15, 'text-anchor': 'middle' });
    label.textContent = formatNumber(tick);
    svg.append(label);
  }
  for (const tick of niceTicks(yRange[0], yRange[1])) {
    svg.append(element('line', { x1: margin.left, x2: margin.left + plotWidth, y1: y(tick), y2: y(tick), stroke: theme.grid, 'stroke-width': 1 }));
    const label = element('text', { ...font, x: margin.left - 6, y: y(tick) + 4, 'text-anchor': 'end' });
    label.textContent = formatNumber(tick);
    svg.append(label);
  }
  // Stability boundary: the imaginary axis (continuous) or the unit circle (sampled).
  if (discrete) {
    svg.append(element('circle', { cx: x(0), cy: y(0), r: 1 / unitsPerPixel, fill: 'none', stroke: theme.muted, 'stroke-width': 1.25, 'stroke-dasharray': '5 3' }));
  } else if (x(0) >= margin.left && x(0) <= margin.left + plotWidth) {
    svg.append(element('line', { x1: x(0), x2: x(0), y1: margin.top, y2: margin.top + plotHeight, stroke: theme.muted, 'stroke-width': 1.25, 'stroke-dasharray': '5 3' }));
  }
  svg.append(element('rect', { x: margin.left, y: margin.top, width: plotWidth, height: plotHeight, fill: 'none', stroke: theme.grid }));

  const unit = discrete ? '' : ' (rad/s)';
  const xLabel = element('text', { ...font, x: margin.left + plotWidth / 2, y: height - 6, 'text-anchor': 'middle' });
  xLabel.textContent = `real part${unit}`;
  const yLabel = element('text', { ...font, x: 14, y: margin.top + plotHeight / 2, 'text-anchor': 'middle', transform: `rotate(-90 14 ${margin.top + plotHeight / 2})` });
  yLabel.textContent = `imaginary part${unit}`;
  svg.append(xLabel, yLabel);

  const size = 5;
  for (const group of groups) {
    for (const p of group.points) {
      if (!Number.isFinite(p.re) || !Number.isFinite(p.im)) continue;
      const cx = x(p.re);
      const cy = y(p.im);
      const mark = element('g', { class: `lw-marker lw-${group.marker}`, stroke: group.colour, 'stroke-width': 2, fill: 'none' });
      if (group.marker === 'cross') {
        mark.append(element('path', { d: `M${cx - size},${cy - size}L${cx + size},${cy + size}M${cx - size},${cy + size}L${cx + size},${cy - size}` }));
      } else if (group.marker === 'diamond') {
        mark.append(element('path', { d: `M${cx},${cy - size - 1}L${cx + size + 1},${cy}L${cx},${cy + size + 1}L${cx - size - 1},${cy}Z` }));
      } else {
        mark.append(element('circle', { cx, cy, r: size }));
      }
      const tip = element('title', {});
      const sign = p.im < 0 ? '−' : '+';
      tip.textContent = `${group.label}: ${formatNumber(p.re)} ${sign} ${formatNumber(Math.abs(p.im))}j`;
      mark.append(tip);
      svg.append(mark);
    }
  }

  const legend = document.createElement('div');
  legend.className = 'lw-pole-legend';
  for (const group of groups) {
    if (group.points.length === 0) continue;
    const item = document.createElement('span');
    item.textContent = `${group.marker === 'cross' ? '×' : group.marker === 'diamond' ? '◇' : '○'} ${group.label}s (${group.points.length})`;
    legend.append(item);
  }
  host.replaceChildren(svg, legend);
}
