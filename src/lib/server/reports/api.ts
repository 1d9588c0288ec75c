/** Request schemas and replies shared by the report pages and the JSON API. */
import { json, error } from '@sveltejs/kit';
import { z } from 'zod';
import { ReportError } from '$lib/server/reports';
import type { Role } from '$lib/members/roles';

/** Who may issue and e-mail reports; every member may read them. */
export const ISSUE_ROLES: Role[] = ['assessor', 'admin'];

export { issueSchema, emailSchema } from '$lib/reports/schema';

/** Issues of a zod error as `{ path, message }`. */
export function zodIssues(e: z.ZodError) {
	return e.issues.map((i) => ({ path: i.path.map(String).join('.') || '(body)', message: i.message }));
}

export { publicOrigin } from '$lib/server/config';

/** Expected refusals as JSON; anything else goes on to handleError (500 with an error id). */
export function apiFailure(e: unknown): Response {
	if (e instanceof ReportError) {
		return json({ message: e.message, issues: e.issues }, { status: e.status });
	}
	throw e;
}

export async function readJsonBody(request: Request): Promise<unknown> {
	try {
		return await request.json();
	} catch {
		error(400, 'The request body must be JSON.');
	}
}

export function pdfResponse(pdf: Buffer, filename: string, disposition: 'inline' | 'attachment' = 'inline') {
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-length': String(pdf.length),
			'content-disposition': `${disposition}; filename="${filename}"`,
			'cache-control': 'private, no-store'
		}
	});
}
