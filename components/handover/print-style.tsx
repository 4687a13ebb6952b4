/** Printing is a web feature; on a device the handover is read on screen. */
export function PrintStyle() {
  return null;
}
