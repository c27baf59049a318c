// Outside Next.js, `server-only` would throw on import (it is an empty module only under Next's
// react-server condition). The soak's plain-Node server resolves it to an empty module instead.
import { register } from 'node:module';

register(
  'data:text/javascript,' +
    encodeURIComponent(`
      export async function resolve(specifier, context, next) {
        if (specifier === 'server-only') return { url: 'data:text/javascript,export%20%7B%7D', shortCircuit: true };
        return next(specifier, context);
      }
    `),
);
