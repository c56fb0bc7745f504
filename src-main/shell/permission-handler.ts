/**
 * Permission requests from the page (camera, microphone, notifications, geolocation, clipboard
 * reading, USB, serial, HID, MIDI, fullscreen by script, ...): all denied. The app needs none;
 * copy and paste by keyboard and the native dialogs work without any web permission.
 */
export function decidePermission(_permission: string, _requestingUrl?: string): boolean {
  return false;
}

/** Device pickers (USB, serial, HID, Bluetooth): always answer "no device". */
export function decideDeviceAccess(_kind: string): boolean {
  return false;
}
