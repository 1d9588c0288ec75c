/** The OpenAPI 3.1 document of /api/v1, merged from every domain's `src/lib/server/<domain>/openapi.ts`. */
import { ENGINE_VERSION } from '$lib/physics';

const modules = import.meta.glob<{ paths?: Record<string, unknown> }>('./*/openapi.ts', {
	eager: true
});

let cached: Record<string, unknown> | null = null;

export function openApiDocument(): Record<string, unknown> {
	if (cached) return cached;
	const paths: Record<string, unknown> = {};
	for (const [file, mod] of Object.entries(modules).sort(([a], [b]) => a.localeCompare(b))) {
		for (const [path, item] of Object.entries(mod.paths ?? {})) {
			if (path in paths) {
				// Two areas describing one path: keep both sets of operations, the earlier file's first.
				paths[path] = { ...(item as object), ...(paths[path] as object) };
				console.warn(`openapi: ${path} is described by more than one module (${file})`);
			} else paths[path] = item;
		}
	}
	cached = {
		openapi: '3.1.0',
		info: {
			title: 'Envelo API',
			version: '1',
			description: `Organisation-scoped JSON API. Sign in first (session cookie). Calculation engine ${ENGINE_VERSION}. Results are steady-state calculations that support, and do not replace, professional judgement.`
		},
		servers: [{ url: '/' }],
		paths
	};
	return cached;
}
