/** The one error shape every API failure answers with. */
export type ApiErrorCode =
  'bad-request' | 'invalid' | 'unauthorized' | 'forbidden' | 'not-found' | 'conflict' | 'payload-too-large' | 'unsupported-media-type' | 'too-many-requests' | 'server-error';

export interface ApiErrorBody {
  error: {
    code: ApiErrorCode;
    message: string;
    /** Field path (dot-joined) to a reason a person can read. */
    fields?: Record<string, string>;
  };
}
