/** The last measured offset of the server's clock from this device's (ms, server minus device), shared by the page. */
export const useClockOffset = () => useState<number>('clock-offset-ms', () => 0)
