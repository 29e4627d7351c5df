/** Contract of the invented demo field: what `buildDemo` put into an empty field log. */
import type { FieldInfo } from './wells.js';

export interface BuildDemoResponse {
  /** Always true: the demo field, its wells and its readings are invented, not a real site. */
  invented: true;
  field: FieldInfo;
  wells: string[];
  reservoir: string;
  reservoirVersions: number;
  liveReadings: number;
  deletedReadings: number;
  flaggedReadings: number;
  corrections: number;
  auditEntries: number;
}
