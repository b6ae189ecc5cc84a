import { isApiError } from '@/lib/api-client';

/** Form fields the server may name in `details[].field`. */
export type FieldErrorSink = (field: string, message: string) => void;

/**
 * Words for a refused admin change. Field problems go beside their fields through `setFieldError`;
 * the return value is the sentence for the notice above the buttons (null when the fields say it all).
 */
export function describeAdminError(
  error: unknown,
  context: { username?: string; knownFields?: readonly string[]; setFieldError?: FieldErrorSink },
): string | null {
  if (!isApiError(error)) return 'The change could not be sent. Try again.';
  const problems = error.fieldProblems;
  if (error.status === 400 && problems.length > 0 && context.setFieldError) {
    const unplaced: string[] = [];
    for (const p of problems) {
      if (context.knownFields?.includes(p.field)) context.setFieldError(p.field, sentence(p.problems.join('; ')));
      else unplaced.push(`${p.field}: ${p.problems.join('; ')}`);
    }
    return unplaced.length > 0 ? `The server did not accept this: ${unplaced.join(' · ')}` : null;
  }
  switch (error.status) {
    case 0:
      return error.message;
    case 403:
      return 'Only an administrator can change users. Your session may belong to another role.';
    case 404:
      return 'This user no longer exists. Reload the list to see who is there now.';
    case 409:
      // username_taken: said in our words beside the field; last_admin and others: the server explains.
      if (error.code === 'username_taken' && context.username && context.setFieldError) {
        context.setFieldError('username', `“${context.username}” is already taken. Choose another user name.`);
        return null;
      }
      return error.message;
    default:
      return error.message;
  }
}

function sentence(text: string): string {
  const t = text.trim();
  if (!t) return t;
  const capital = t[0].toUpperCase() + t.slice(1);
  return /[.!?]$/.test(capital) ? capital : `${capital}.`;
}
