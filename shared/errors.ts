import { z } from 'zod';

// Every API error has this body: {"error": {"code", "message", "field"?}}.

export const ERROR_CODES = [
  'validation_failed',
  'malformed_json',
  'unauthenticated',
  'forbidden',
  'not_found',
  'conflict',
  'invalid_credentials',
  'invitation_used',
  'invitation_expired',
  'invitation_revoked',
  'payload_too_large',
  'rate_limited',
  'csrf_rejected',
  'unsupported_media_type',
  'internal_error',
  'password_change_required',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    field: z.string().optional(),
  }),
});
export type ApiErrorBody = z.infer<typeof apiErrorSchema>;

export const STATUS_OF: Record<ErrorCode, number> = {
  validation_failed: 400,
  malformed_json: 400,
  unauthenticated: 401,
  forbidden: 403,
  csrf_rejected: 403,
  not_found: 404,
  conflict: 409,
  invalid_credentials: 401,
  invitation_used: 409,
  invitation_expired: 410,
  invitation_revoked: 410,
  payload_too_large: 413,
  unsupported_media_type: 415,
  rate_limited: 429,
  internal_error: 500,
  password_change_required: 403,
};
