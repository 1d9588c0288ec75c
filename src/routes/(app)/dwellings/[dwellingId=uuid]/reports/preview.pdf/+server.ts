import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { requireMember } from '$lib/server/guard';
import { previewReport } from '$lib/server/reports';
import { AppError } from '$lib/server/errors';
import { pdfResponse } from '$lib/server/http';

/** A draft PDF of the dwelling, or of one element with ?element=<id>. Never stored, marked DRAFT. */
export const GET = async (event) => {
	const member = requireMember(event);
	const element = event.url.searchParams.get('element');
	const parsed = z
		.uuid()
		.nullable()
		.safeParse(element || null);
	if (!parsed.success) error(400, 'element must be the id of an element of this dwelling.');
	try {
		const { pdf, filename } = await previewReport(
			{ userId: member.user.id, organisationId: member.organisationId },
			{ dwellingId: event.params.dwellingId, elementId: parsed.data }
		);
		return pdfResponse(pdf, filename);
	} catch (e) {
		if (e instanceof AppError) error(e.status, e.message);
		throw e;
	}
};
