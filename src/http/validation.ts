import type { FastifySchemaCompiler } from 'fastify';
import type { z } from 'zod';
import { isStream } from './receive.js';

/**
 * Mirrors fastify-type-provider-zod's error shape (it does not export its builder), marked with the
 * same symbol so `hasZodFastifySchemaValidationErrors` recognises it.
 */
function createValidationError(error: z.ZodError) {
  const marker = Symbol.for('ZodFastifySchemaValidationError');
  return error.issues.map((issue) => {
    const { path, code, message, ...params } = issue as z.core.$ZodIssue;
    return { [marker]: true, keyword: code, instancePath: `/${path.join('/')}`, schemaPath: `#/${path.join('/')}/${code}`, message, params };
  });
}

/** The same error shape fastify produces for schema violations, for checks made in a handler. */
export function validationError(error: z.ZodError, context: 'body' | 'querystring' | 'params') {
  return Object.assign(new Error('validation failed'), { validation: createValidationError(error), validationContext: context, statusCode: 400 });
}

/**
 * A per-route validator that checks some parts with lighter schemas than the documented ones
 * (bulky sample arrays are checked by the decoders) and passes binary bodies through. The parsed
 * body is not substituted unless `parsedBody` is set (a schema that tags what it parsed), so
 * handlers otherwise see the body as sent.
 */
export function zodValidator(parts: Partial<Record<'body' | 'querystring' | 'params', z.ZodType>>, options: { parsedBody?: boolean } = {}): FastifySchemaCompiler<unknown> {
  return ({ httpPart }) => {
    const schema = parts[httpPart as keyof typeof parts];
    return (data: unknown) => {
      if (!schema || isStream(data)) return { value: data };
      const parsed = schema.safeParse(data);
      if (parsed.success) return { value: httpPart === 'body' && !options.parsedBody ? data : parsed.data };
      const issues = createValidationError(parsed.error);
      return { error: Object.assign(new Error(issues[0]?.message ?? 'invalid'), { validation: issues }) };
    };
  };
}
