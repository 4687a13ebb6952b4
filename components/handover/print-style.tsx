/** Printing is a web feature; on a device the handover is read on screen. */
export function PrintStyle() {
  return null;
}

/** When the handover is printed; on a device, when it was drawn. */
export function usePrintTime(): number {
  return Date.now();
}
