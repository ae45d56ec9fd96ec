// Messages between the extension and the response panel's script.

/** Extension → panel. `report` is the server's ControllerReport (JSON), null when there is nothing to draw. */
export interface ReportMessage {
  type: 'report';
  title: string;
  report: unknown;
  /** A line shown above the plots (not designed, analysis skipped, document closed…). */
  note?: string;
}
export type PanelMessage = ReportMessage;

/** Panel → extension. */
export type PanelReply = { type: 'ready' } | { type: 'rendered' };
