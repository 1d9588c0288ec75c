import { error, type RequestEvent } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { contentDisposition, getEvidenceFile } from '$lib/server/evidence';
import { refusalOf } from '$lib/server/errors';

/**
 * A stored file of the caller's organisation, streamed from the store: never cached, never sniffed, with
 * a safe file name. `?download=1` saves it instead of showing it. Another organisation's id is a 404.
 */
export async function evidenceFile(
	event: Pick<RequestEvent, 'locals' | 'url'> & { params: { evidenceId: string } },
	variant: 'original' | 'thumbnail'
): Promise<Response> {
	const member = requireMember(event);
	let file: Awaited<ReturnType<typeof getEvidenceFile>>;
	try {
		file = await getEvidenceFile(member.organisationId, event.params.evidenceId, variant);
	} catch (e) {
		const refusal = refusalOf(e);
		if (!refusal) throw e;
		error(refusal.status, refusal.message);
	}
	const download = event.url.searchParams.get('download') === '1';
	const headers: Record<string, string> = {
		'content-type': file.contentType,
		'content-disposition': contentDisposition(download ? 'attachment' : 'inline', file.filename),
		'cache-control': 'private, no-store',
		'x-content-type-options': 'nosniff'
	};
	if (file.bytes !== null) headers['content-length'] = String(file.bytes);
	// Images shown on their own run nothing; a PDF keeps the browser's viewer, which a sandbox would block.
	if (file.contentType.startsWith('image/'))
		headers['content-security-policy'] = "default-src 'none'; img-src 'self'; sandbox";
	return new Response(file.body, { headers });
}
