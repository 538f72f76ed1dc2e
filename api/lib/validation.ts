import { z } from 'zod';

type Issue = z.core.$ZodIssue;

function valueAt(root: unknown, path: readonly PropertyKey[]): unknown {
  let v = root;
  for (const key of path) v = v !== null && typeof v === 'object' ? (v as Record<PropertyKey, unknown>)[key] : undefined;
  return v;
}

/**
 * A plain union (such as a temperature range or list) that fails reports only "Invalid input" at
 * its own path. Point instead into the option the body evidently meant, the one whose keys are
 * least absent from the body and then with the fewest issues, so errors[].path names the field.
 */
function sharpen(issues: readonly Issue[], body: unknown, prefix: readonly PropertyKey[] = []): Issue[] {
  return issues.flatMap((issue): Issue[] => {
    const path = [...prefix, ...issue.path];
    if (issue.code !== 'invalid_union' || issue.errors.length === 0) return [{ ...issue, path } as Issue];
    const input = valueAt(body, path);
    const absent = (i: Issue) =>
      i.path.length > 0 && (input === null || typeof input !== 'object' || !Object.hasOwn(input, i.path[0] as PropertyKey));
    const rank = (list: Issue[]) => [list.filter(absent).length, list.length] as const;
    const best = [...issue.errors].sort((a, b) => {
      const [ma, na] = rank(a);
      const [mb, nb] = rank(b);
      return ma - mb || na - nb;
    })[0]!;
    const [missing, count] = rank(best);
    // Every option lacks its keys: nothing says which one was meant, so keep the union's own issue.
    if (missing === count && count > 0) {
      return [{ ...issue, path, message: 'matches none of the accepted shapes (see the API description)' } as Issue];
    }
    return sharpen(best, body, path);
  });
}

/**
 * The one entry point for checking what a client sent: a JSON body, a query string or a JSON form
 * field of a multipart body (then `prefix` is the field's name). On failure it throws a ZodError
 * whose issues point at the offending field, as a path into the request.
 */
export function parseBody<S extends z.ZodType>(schema: S, body: unknown, prefix: readonly PropertyKey[] = []): z.infer<S> {
  const input = body ?? {};
  const result = schema.safeParse(input);
  if (result.success) return result.data;
  throw new z.ZodError(sharpen(result.error.issues, input).map((issue) => ({ ...issue, path: [...prefix, ...issue.path] }) as Issue));
}
