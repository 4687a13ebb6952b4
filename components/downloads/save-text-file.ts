import { Share } from 'react-native';

/** On a phone, hand the text to the share sheet (a mail or files app saves it). */
export function saveTextFile(filename: string, text: string, _mime?: string): void {
  void Share.share({ title: filename, message: text });
}
