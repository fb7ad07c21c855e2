// The one shape every API error has.
export type ApiErrorBody = {
  error: { code: string; message: string; details?: unknown };
};
