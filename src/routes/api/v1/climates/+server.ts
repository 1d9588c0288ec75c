import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { createClimate, listClimates } from '$lib/server/climates';
import { parseClimateCsv } from '$lib/server/climates/import';
import { climateInputSchema } from '$lib/climates/schema';
import { errorResponse, invalid, readJson } from '$lib/server/http';

/** The organisation's climates. */
export const GET = async (event) => {
	const member = requireMember(event);
	return json({ items: await listClimates(member.organisationId) });
};

/**
 * A new climate (admins). JSON `{ name, source, illustrative?, months: [{ month, temperature, relativeHumidity }] × 12 }`,
 * or JSON with `csv` (the file's text) instead of `months`, or a `text/csv` body with `?name=&source=&illustrative=`.
 */
export const POST = async (event) => {
	const member = requireRole(event, 'admin');
	const type = event.request.headers.get('content-type') ?? '';
	let raw: Record<string, unknown>;
	if (type.startsWith('text/csv') || type.startsWith('text/plain')) {
		const q = event.url.searchParams;
		raw = {
			name: q.get('name') ?? undefined,
			source: q.get('source') ?? undefined,
			illustrative: q.get('illustrative') === 'true',
			csv: new Uint8Array(await event.request.arrayBuffer())
		};
	} else {
		const body = await readJson(event.request);
		raw = typeof body === 'object' && body !== null && !Array.isArray(body) ? { ...body } : {};
	}
	if (raw.csv !== undefined) {
		if (typeof raw.csv !== 'string' && !(raw.csv instanceof Uint8Array)) {
			return json(
				{ message: 'csv must be the text of the file.', issues: [{ path: 'csv', message: 'must be text' }] },
				{ status: 400 }
			);
		}
		const parsed = parseClimateCsv(raw.csv);
		if (!parsed.ok) {
			return json(
				{
					message: `The CSV has ${parsed.problems.length} problem${parsed.problems.length === 1 ? '' : 's'}: ${parsed.problems.map((p) => p.message).join('; ')}`,
					issues: parsed.problems.map((p) => ({
						path: 'csv',
						line: p.line,
						field: p.field,
						message: p.message
					}))
				},
				{ status: 400 }
			);
		}
		raw.months = parsed.months;
		delete raw.csv;
	}
	const input = climateInputSchema.safeParse(raw);
	if (!input.success) return invalid(input.error, 'climate');
	try {
		return json(await createClimate(member, input.data), { status: 201 });
	} catch (e) {
		return errorResponse(e);
	}
};
