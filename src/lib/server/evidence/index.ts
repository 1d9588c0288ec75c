/**
 * Evidence: photos and documents attached to a dwelling, an element or a layer of an element, and the
 * supervisor's requests for more.
 *
 * An upload is read as it arrives (`openEvidenceUpload`, busboy through `$lib/server/csv/upload`): every
 * chunk is counted against the size limit, hashed (SHA-256) and written to a private temporary file; the
 * first bytes decide the type by content (JPEG, PNG or PDF, whatever the name says). Images get a
 * thumbnail. Then the objects go to the store (`./storage`) and only then is the row inserted, in a
 * transaction with its log entry and the requests it answers; if that transaction fails the objects are
 * deleted again, so there is never a row without its file.
 *
 * Files are served only through `getEvidenceFile`, which looks the row up within the caller's
 * organisation: another organisation's id is a 404 like a missing one.
 *
 * The deletion rule: evidence may be deleted until it is listed in an issued report. Every report of the
 * dwelling lists all of its evidence (`evidenceForReport`), so once any report of the dwelling has been
 * issued after the upload the evidence is part of an issued record and is kept (the database marks it,
 * `reported_at`, and refuses the delete).
 */
import { createHash, randomUUID } from 'node:crypto';
import { mkdtemp, open, rm } from 'node:fs/promises';
import { createReadStream } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileTypeFromBuffer } from 'file-type';
import sharp from 'sharp';
import { z } from 'zod';
import { db, type Db } from '$lib/server/db';
import type { Evidence as SharedEvidence, EvidenceRequest } from '$lib/evidence/types';
import { logActivity } from '$lib/server/activity';
import type { Member } from '$lib/server/guard';
import { readUpload, type Upload } from '$lib/server/csv/upload';
import { parseWith } from '$lib/server/http';
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from '$lib/server/errors';
import { DECIDER_ROLES } from '$lib/audit/rules';
import { calendarDay } from '$lib/format';
import type { Role } from '$lib/members/roles';
import { deleteObjectsQuietly, getObject, putObject } from './storage';

/* ------------------------------------------------------------------ limits and types */

/**
 * The largest file accepted, bytes: 15 MB (decimal, as file managers show sizes), ample for a phone photo
 * or a product data sheet (common practice, no source).
 */
export const MAX_EVIDENCE_BYTES = 15_000_000;
/** Longest side of a thumbnail, px. */
export const THUMBNAIL_PX = 320;
/** What file-type reads to decide a type (its documented minimum sample). */
const SNIFF_BYTES = 4100;
/** Room for the multipart framing and the form fields around the file, bytes. */
const MULTIPART_OVERHEAD = 256 * 1024;

/** The types accepted, by content: their label and the file-name endings that go with them. */
export const EVIDENCE_TYPES = {
	'image/jpeg': { label: 'JPEG', extensions: ['jpg', 'jpeg'], image: true },
	'image/png': { label: 'PNG', extensions: ['png'], image: true },
	'application/pdf': { label: 'PDF', extensions: ['pdf'], image: false }
} as const;
export type EvidenceContentType = keyof typeof EVIDENCE_TYPES;

/** What the upload form shows and its file input accepts. */
export const EVIDENCE_LIMITS = {
	maxBytes: MAX_EVIDENCE_BYTES,
	accept: Object.keys(EVIDENCE_TYPES).join(','),
	description: 'JPEG or PNG photos and PDF documents, up to 15 MB each; the type is checked by content.'
};

/** Who uploads and deletes evidence (as for dwellings and elements); every member sees it. */
export const EVIDENCE_WRITE_ROLES: readonly Role[] = ['assessor', 'admin'];
/** Who answers a request explicitly: the assessors, or the supervisor who no longer needs it. */
const ANSWER_ROLES: readonly Role[] = ['assessor', 'admin', 'supervisor'];

/* ------------------------------------------------------------------ request schemas */

const uuidField = (label: string) => z.uuid({ error: `${label} must be an id` });

/** The form fields of an upload (before the file): which element, and which layer of it (0-based). */
export const uploadFieldsSchema = z
	.object({
		elementId: z.union([z.literal(''), uuidField('elementId')]).optional(),
		layerIndex: z
			.union([
				z.literal(''),
				z.coerce
					.number({ error: 'layerIndex must be a number' })
					.int('layerIndex must be a whole number')
					.min(0, 'layerIndex counts from 0 (the first layer)')
					.max(999, 'layerIndex must be at most 999')
			])
			.optional()
	})
	.transform((v) => ({
		elementId: v.elementId ? v.elementId : null,
		layerIndex: v.layerIndex === '' || v.layerIndex === undefined ? null : v.layerIndex
	}))
	.refine((v) => v.layerIndex === null || v.elementId !== null, {
		path: ['layerIndex'],
		message: 'a layer needs its element: give elementId as well'
	});

const todayUtc = () => new Date().toISOString().slice(0, 10);

/** A supervisor's request: what is needed, and by when (today or later, UTC). */
export const evidenceRequestSchema = z.object({
	note: z
		.string({ error: 'note must be text' })
		.trim()
		.min(1, 'note is required: say what evidence is needed')
		.max(2000, 'note must be at most 2000 characters'),
	dueDate: z.iso
		.date({ error: 'dueDate must be a date, YYYY-MM-DD' })
		.refine((d) => d >= todayUtc(), 'dueDate must be today or later')
});

/** An explicit answer, optionally naming the evidence of the dwelling that answers it. */
export const evidenceAnswerSchema = z.object({ evidenceId: uuidField('evidenceId').nullish() });

/* ------------------------------------------------------------------ names */

const UNSAFE_IN_NAME = /[\u0000-\u001f\u007f"\\/:*?<>|]/g;

/** A file name as a person gave it, made safe to store and to send back: no path, no control characters. */
export function safeFileName(raw: string): string {
	const base = raw.normalize('NFC').split(/[\\/]/).pop() ?? '';
	let name = base
		.replace(UNSAFE_IN_NAME, '_')
		.replace(/\s+/g, ' ')
		.replace(/^[\s.]+|[\s.]+$/g, '');
	if (name.length > 150) {
		const dot = name.lastIndexOf('.');
		const ext = dot > 0 && name.length - dot <= 10 ? name.slice(dot) : '';
		name = name.slice(0, 150 - ext.length) + ext;
	}
	return name || 'evidence';
}

/** The name a download gets: the stored name, with the ending of its real type added when it lacks one. */
export function downloadName(name: string, contentType: string): string {
	const type = EVIDENCE_TYPES[contentType as EvidenceContentType];
	if (!type) return name;
	const ext = name.split('.').pop()?.toLowerCase() ?? '';
	return (type.extensions as readonly string[]).includes(ext) ? name : `${name}.${type.extensions[0]}`;
}

/** `Content-Disposition` with an ASCII fallback and the UTF-8 name (RFC 6266, RFC 8187). */
export function contentDisposition(kind: 'inline' | 'attachment', name: string): string {
	const ascii = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\%]/g, '_');
	const encoded = encodeURIComponent(name).replace(
		/['()*]/g,
		(c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`
	);
	return `${kind}; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}

/* ------------------------------------------------------------------ rows */

/** Evidence whose type is one the service accepts. */
export type Evidence = SharedEvidence & { contentType: EvidenceContentType };
export type { EvidenceRequest };

const iso = (v: unknown) => (v ? new Date(v as string).toISOString() : null);

function evidenceQuery(trx: Db, organisationId: string) {
	return trx('evidence as e')
		.leftJoin('elements as el', function () {
			this.on('el.id', '=', 'e.element_id').andOn('el.organisation_id', '=', 'e.organisation_id');
		})
		.leftJoin('users as u', 'u.id', 'e.uploaded_by')
		.leftJoin('dwellings as d', 'd.id', 'e.dwelling_id')
		.where('e.organisation_id', organisationId)
		.select(
			'e.*',
			'el.name as element_name',
			'u.name as uploader_name',
			'u.email as uploader_email',
			'd.assessor_id',
			'd.status as dwelling_status'
		);
}

/** Who may delete evidence now: its uploader, the dwelling's assessor or an admin, until it is reported. */
function mayDelete(member: Member | null, r: Record<string, unknown>): boolean {
	if (!member || !EVIDENCE_WRITE_ROLES.includes(member.role)) return false;
	if (r.reported_at || r.dwelling_status === 'archived') return false;
	const uid = member.user.id;
	return member.role === 'admin' || r.uploaded_by === uid || r.assessor_id === uid;
}

function toEvidence(r: Record<string, unknown>, member: Member | null): Evidence {
	const id = r.id as string;
	return {
		id,
		dwellingId: r.dwelling_id as string,
		elementId: (r.element_id as string | null) ?? null,
		elementName: (r.element_name as string | null) ?? null,
		layerIndex: r.layer_index === null || r.layer_index === undefined ? null : Number(r.layer_index),
		layerName: (r.layer_name as string | null) ?? null,
		name: r.name as string,
		contentType: r.content_type as EvidenceContentType,
		bytes: Number(r.bytes),
		sha256: r.sha256 as string,
		uploadedBy: {
			id: r.uploaded_by as string,
			name: ((r.uploader_name ?? r.uploader_email) as string | null) ?? null
		},
		createdAt: iso(r.created_at)!,
		reportedAt: iso(r.reported_at),
		url: `/evidence/${id}`,
		thumbnailUrl: r.thumbnail_key ? `/evidence/${id}/thumbnail` : null,
		deletable: mayDelete(member, r)
	};
}

function requestQuery(trx: Db, organisationId: string) {
	return trx('evidence_requests as r')
		.join('audit_items as i', 'i.id', 'r.audit_item_id')
		.leftJoin('users as q', 'q.id', 'r.requested_by')
		.leftJoin('users as a', 'a.id', 'r.answered_by')
		.where('r.organisation_id', organisationId)
		.select(
			'r.*',
			'i.batch_id',
			trx.raw(`to_char(r.due_date, 'YYYY-MM-DD') as due_day`),
			trx.raw(`(r.answered_at IS NULL AND r.due_date < (now() AT TIME ZONE 'UTC')::date) as is_overdue`),
			'q.name as requester_name',
			'q.email as requester_email',
			'a.name as answerer_name',
			'a.email as answerer_email'
		)
		.orderBy([{ column: 'r.created_at', order: 'desc' }, { column: 'r.id' }]);
}

function toRequest(r: Record<string, unknown>): EvidenceRequest {
	return {
		id: r.id as string,
		dwellingId: r.dwelling_id as string,
		auditItemId: r.audit_item_id as string,
		batchId: r.batch_id as string,
		requestedBy: {
			id: r.requested_by as string,
			name: ((r.requester_name ?? r.requester_email) as string | null) ?? null
		},
		note: r.note as string,
		dueDate: (r.due_day as string) ?? calendarDay(r.due_date),
		createdAt: iso(r.created_at)!,
		answeredAt: iso(r.answered_at),
		answeredBy: r.answered_by
			? {
					id: r.answered_by as string,
					name: ((r.answerer_name ?? r.answerer_email) as string | null) ?? null
				}
			: null,
		answerEvidenceId: (r.answer_evidence_id as string | null) ?? null,
		overdue: Boolean(r.is_overdue)
	};
}

/* ------------------------------------------------------------------ reads */

/** The dwelling's evidence, oldest first, or null when the dwelling is not the organisation's. */
export async function listEvidence(member: Member, dwellingId: string): Promise<Evidence[] | null> {
	const org = member.organisationId;
	if (!(await db('dwellings').where({ organisation_id: org, id: dwellingId }).first('id'))) return null;
	const rows = await evidenceQuery(db, org)
		.andWhere('e.dwelling_id', dwellingId)
		.orderBy([{ column: 'e.created_at' }, { column: 'e.id' }]);
	return rows.map((r) => toEvidence(r, member));
}

/** Requests of one audit item or of one dwelling (every audit of it), newest first. */
export async function listEvidenceRequests(
	organisationId: string,
	of: { auditItemId: string } | { dwellingId: string }
): Promise<EvidenceRequest[]> {
	const q = requestQuery(db, organisationId);
	if ('auditItemId' in of) q.andWhere('r.audit_item_id', of.auditItemId);
	else q.andWhere('r.dwelling_id', of.dwellingId);
	return (await q).map(toRequest);
}

/** The requests of an audit item of the organisation, or null when there is no such item. */
export async function listRequestsForItem(
	organisationId: string,
	itemId: string
): Promise<EvidenceRequest[] | null> {
	const item = await db('audit_items').where({ organisation_id: organisationId, id: itemId }).first('id');
	return item ? listEvidenceRequests(organisationId, { auditItemId: itemId }) : null;
}

export type EvidenceTarget = { id: string; name: string; layers: string[] };

/** What evidence can be attached to: the dwelling's elements in their order, each with its layer names. */
export async function listEvidenceTargets(organisationId: string, dwellingId: string) {
	const rows = await db('elements')
		.where({ organisation_id: organisationId, dwelling_id: dwellingId })
		.orderBy([{ column: 'position' }, { column: 'created_at' }])
		.select('id', 'name', db.raw(`coalesce(build_up->'layers', '[]'::jsonb) as layers`));
	return rows.map((r): EvidenceTarget => ({
		id: r.id,
		name: r.name,
		layers: (r.layers as { name?: string }[]).map((l, i) => l?.name || `Layer ${i + 1}`)
	}));
}

/**
 * Everything the evidence panel shows for a dwelling: its evidence, the requests of its audits, what an
 * upload can be attached to, the limits, and whether the caller may upload. Null when the dwelling is
 * not the organisation's.
 */
export async function evidencePanel(member: Member, dwellingId: string) {
	const org = member.organisationId;
	const dwelling = await db('dwellings')
		.where({ organisation_id: org, id: dwellingId })
		.first('id', 'reference', 'status');
	if (!dwelling) return null;
	const [items, requests, targets] = await Promise.all([
		listEvidence(member, dwellingId),
		listEvidenceRequests(org, { dwellingId }),
		listEvidenceTargets(org, dwellingId)
	]);
	return {
		dwelling: { id: dwelling.id as string, reference: dwelling.reference as string },
		items: items ?? [],
		requests,
		targets,
		limits: EVIDENCE_LIMITS,
		canUpload: EVIDENCE_WRITE_ROLES.includes(member.role) && dwelling.status !== 'archived',
		today: todayUtc()
	};
}
export type EvidencePanel = NonNullable<Awaited<ReturnType<typeof evidencePanel>>>;

/* ------------------------------------------------------------------ upload: reading the file */

const refuseFile = (message: string, status: 400 | 413 = 400) =>
	new ValidationError([{ path: 'file', message }], message, {}, status);

const tooLarge = (name: string) =>
	refuseFile(
		`“${name}” is larger than 15 MB, the most a single file of evidence may be: nothing was saved. Reduce the photo’s resolution or split the document.`,
		413
	);

/**
 * A 413 before anything is read when the request says it is larger than any accepted file could make it.
 */
export function checkUploadLength(request: Request): void {
	const length = Number(request.headers.get('content-length') ?? 0);
	if (length > MAX_EVIDENCE_BYTES + MULTIPART_OVERHEAD) {
		throw refuseFile(
			`The upload is ${(length / 1_000_000).toFixed(1)} MB; a file of evidence may be at most 15 MB: nothing was saved.`,
			413
		);
	}
}

/** The multipart upload of a request (fields first, then `file`), read as it arrives. */
export async function openEvidenceUpload(request: Request, url: URL): Promise<Upload> {
	checkUploadLength(request);
	const type = (request.headers.get('content-type') ?? '').toLowerCase();
	if (!type.startsWith('multipart/form-data') || !request.body) {
		throw refuseFile(
			'Send the file as multipart/form-data in a field named "file" (optional fields elementId and layerIndex before it).'
		);
	}
	return readUpload(request, url, 'file');
}

/** What file-type says a refused file is, in words. */
function describeType(found: { ext: string; mime: string } | undefined): string {
	if (!found) return 'its content is none of these (text, or a format that is not recognised)';
	if (found.ext === 'elf') return 'its content is a program (an ELF executable)';
	if (found.ext === 'exe') return 'its content is a Windows program (an EXE)';
	return `its content is ${found.ext.toUpperCase()} (${found.mime})`;
}

/** The accepted type of a file from its first bytes, or a 400 saying what it is not (and what it is). */
async function typeByContent(name: string, head: Uint8Array): Promise<EvidenceContentType> {
	if (head.length === 0) throw refuseFile(`“${name}” is empty: nothing was saved.`);
	const found = await fileTypeFromBuffer(head);
	if (found && found.mime in EVIDENCE_TYPES) return found.mime as EvidenceContentType;
	const ext = name.includes('.') ? name.split('.').pop()!.toLowerCase() : '';
	const claimed = ext ? ` although its name ends in .${ext}` : '';
	throw refuseFile(
		`“${name}” is not a JPEG, PNG or PDF file${claimed}: ${describeType(found)}. Only JPEG and PNG photos and PDF documents are accepted, checked by their content.`
	);
}

type Received = { path: string; bytes: number; sha256: string; contentType: EvidenceContentType };

/**
 * Write the file to `path` as it arrives, counting (413 past the limit), hashing with SHA-256 and deciding
 * its type from the first bytes (a refused type stops the reading there).
 */
async function receiveFile(name: string, chunks: AsyncIterable<Uint8Array>, path: string): Promise<Received> {
	const hash = createHash('sha256');
	const out = await open(path, 'wx', 0o600);
	let bytes = 0;
	let head: Buffer[] | null = [];
	let contentType: EvidenceContentType | null = null;
	try {
		for await (const chunk of chunks) {
			bytes += chunk.length;
			if (bytes > MAX_EVIDENCE_BYTES) throw tooLarge(name);
			hash.update(chunk);
			if (head) {
				head.push(Buffer.from(chunk));
				if (bytes >= SNIFF_BYTES) {
					contentType = await typeByContent(name, Buffer.concat(head));
					head = null;
				}
			}
			await out.write(chunk);
		}
	} finally {
		await out.close();
	}
	contentType ??= await typeByContent(name, Buffer.concat(head ?? []));
	return { path, bytes, sha256: hash.digest('hex'), contentType };
}

/** A JPEG thumbnail of an image, THUMBNAIL_PX on its longest side, turned as the camera held it. */
async function makeThumbnail(name: string, path: string, label: string): Promise<Buffer> {
	try {
		return await sharp(path, { limitInputPixels: 100_000_000 })
			.rotate()
			.resize({ width: THUMBNAIL_PX, height: THUMBNAIL_PX, fit: 'inside', withoutEnlargement: true })
			.flatten({ background: '#ffffff' })
			.jpeg({ quality: 80 })
			.toBuffer();
	} catch {
		throw refuseFile(
			`“${name}” begins like a ${label} image but cannot be read as one (damaged, incomplete or too large in pixels): nothing was saved.`
		);
	}
}

/* ------------------------------------------------------------------ upload: storing it */

type Target = { elementId: string | null; layerIndex: number | null; layerName: string | null };

/** The dwelling (and element, and layer) an upload is for; 404, 409 or 400 before any byte is read. */
async function uploadTarget(
	trx: Db,
	member: Member,
	dwellingId: string,
	fields: { elementId: string | null; layerIndex: number | null }
): Promise<Target> {
	const org = member.organisationId;
	const d = await trx('dwellings').where({ organisation_id: org, id: dwellingId }).first('status');
	if (!d) throw new NotFoundError('No such dwelling.');
	if (d.status === 'archived')
		throw new ConflictError('This dwelling is archived; restore it before adding evidence.');
	if (!fields.elementId) return { elementId: null, layerIndex: null, layerName: null };
	const el = await trx('elements')
		.where({ organisation_id: org, dwelling_id: dwellingId, id: fields.elementId })
		.first('id', 'build_up');
	if (!el) throw new NotFoundError('No such element in this dwelling.');
	if (fields.layerIndex === null) return { elementId: el.id, layerIndex: null, layerName: null };
	const layers = (el.build_up?.layers ?? []) as { name?: string }[];
	if (fields.layerIndex >= layers.length) {
		const message = layers.length
			? `the element has ${layers.length} layer${layers.length === 1 ? '' : 's'} (layerIndex 0 to ${layers.length - 1})`
			: 'the element has no layers (a given U-value): attach the file to the element instead';
		throw new ValidationError([{ path: 'layerIndex', message }], `layerIndex: ${message}.`);
	}
	const layerName = layers[fields.layerIndex]?.name || `Layer ${fields.layerIndex + 1}`;
	return { elementId: el.id, layerIndex: fields.layerIndex, layerName };
}

/** Fields that came after the file could not be used: a 400 rather than evidence on the wrong target. */
function refuseLateFields(upload: Upload) {
	const late = upload.lateFields().filter((f) => f === 'elementId' || f === 'layerIndex');
	if (late.length) {
		const message = `The field${late.length === 1 ? '' : 's'} ${late.join(', ')} came after the file and could not be used: put the fields before the file. Nothing was saved.`;
		throw new ValidationError(
			late.map((path) => ({ path, message: 'must come before the file' })),
			message
		);
	}
}

/** Object keys: under the organisation and dwelling, named by the evidence id. */
const keysFor = (org: string, dwellingId: string, id: string, image: boolean) => ({
	storage: `evidence/${org}/${dwellingId}/${id}`,
	thumbnail: image ? `evidence/${org}/${dwellingId}/${id}-thumbnail.jpg` : null
});

/**
 * Store an uploaded file as evidence of the dwelling (of an element, of a layer): read, checked and hashed
 * as it arrives, thumbnailed when it is an image, put in the store, then recorded with its log entry; the
 * dwelling's open evidence requests are answered by it. Assessors and admins.
 */
export async function uploadEvidence(member: Member, dwellingId: string, upload: Upload): Promise<Evidence> {
	if (!EVIDENCE_WRITE_ROLES.includes(member.role))
		throw new ForbiddenError('Only assessors and admins add evidence; supervisors request it.');
	const fields = parseWith(uploadFieldsSchema, Object.fromEntries(upload.fields), 'upload');
	const target = await uploadTarget(db, member, dwellingId, fields);
	if (!upload.file) throw refuseFile('Choose a file to upload (field "file").');
	// readUpload names a file sent without a name "upload.csv"; no evidence is ever a CSV file.
	const given = upload.file.name === 'upload.csv' ? '' : upload.file.name;
	const name = safeFileName(given);
	const dir = await mkdtemp(join(tmpdir(), 'envelo-evidence-'));
	try {
		const file = await receiveFile(name, upload.file.chunks, join(dir, 'upload'));
		await upload.finish();
		refuseLateFields(upload);
		const type = EVIDENCE_TYPES[file.contentType];
		const thumbnail = type.image ? await makeThumbnail(name, file.path, type.label) : null;
		const id = randomUUID();
		const keys = keysFor(member.organisationId, dwellingId, id, thumbnail !== null);
		await storeObjects(keys, file, thumbnail);
		try {
			await recordUpload(member, dwellingId, id, { name, file, keys, target });
		} catch (e) {
			await deleteObjectsQuietly([keys.storage, keys.thumbnail]);
			throw e;
		}
		const row = await evidenceQuery(db, member.organisationId).andWhere('e.id', id).first();
		return toEvidence(row, member);
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}

/** Put the file and its thumbnail; when the thumbnail fails the file is taken out again. */
async function storeObjects(
	keys: { storage: string; thumbnail: string | null },
	file: Received,
	thumbnail: Buffer | null
) {
	await putObject(keys.storage, createReadStream(file.path), {
		contentType: file.contentType,
		bytes: file.bytes,
		sha256: file.sha256
	});
	if (!thumbnail || !keys.thumbnail) return;
	try {
		await putObject(keys.thumbnail, thumbnail, {
			contentType: 'image/jpeg',
			bytes: thumbnail.length,
			sha256: createHash('sha256').update(thumbnail).digest('hex')
		});
	} catch (e) {
		await deleteObjectsQuietly([keys.storage]);
		throw e;
	}
}

/** The row, the requests it answers and the log entries, in one transaction (after the objects are stored). */
async function recordUpload(
	member: Member,
	dwellingId: string,
	id: string,
	u: { name: string; file: Received; keys: { storage: string; thumbnail: string | null }; target: Target }
) {
	await db.transaction(async (t) => {
		// The dwelling may have been archived, or the element deleted, while the file came in.
		const d = await t('dwellings')
			.where({ organisation_id: member.organisationId, id: dwellingId })
			.forShare()
			.first('id');
		if (!d) throw new NotFoundError('No such dwelling.');
		const target = await uploadTarget(t, member, dwellingId, u.target);
		await t('evidence').insert({
			id,
			organisation_id: member.organisationId,
			dwelling_id: dwellingId,
			element_id: target.elementId,
			layer_index: target.layerIndex,
			layer_name: target.layerName,
			name: u.name,
			content_type: u.file.contentType,
			bytes: u.file.bytes,
			sha256: u.file.sha256,
			storage_key: u.keys.storage,
			thumbnail_key: u.keys.thumbnail,
			uploaded_by: member.user.id
		});
		const answered = await answerOpenRequests(t, member, dwellingId, id);
		await logActivity(
			{
				organisationId: member.organisationId,
				userId: member.user.id,
				action: 'upload',
				entity: 'evidence',
				entityId: id,
				details: {
					dwellingId,
					elementId: target.elementId,
					layerIndex: target.layerIndex,
					name: u.name,
					contentType: u.file.contentType,
					bytes: u.file.bytes,
					sha256: u.file.sha256,
					answeredRequestIds: answered
				}
			},
			t
		);
	});
}

/** Every open request of the dwelling is answered by this upload (it came after them); their ids. */
async function answerOpenRequests(t: Db, member: Member, dwellingId: string, evidenceId: string) {
	const rows: { id: string; audit_item_id: string }[] = await t('evidence_requests')
		.where({ organisation_id: member.organisationId, dwelling_id: dwellingId })
		.whereNull('answered_at')
		.update({ answered_at: t.fn.now(), answered_by: member.user.id, answer_evidence_id: evidenceId })
		.returning(['id', 'audit_item_id']);
	for (const r of rows) {
		await logRequest(t, member, r.audit_item_id, 'evidence-answer', {
			requestId: r.id,
			evidenceId,
			automatic: true
		});
	}
	return rows.map((r) => r.id);
}

/* ------------------------------------------------------------------ serving and deleting */

/**
 * A stored file (or its thumbnail) of the organisation, as a stream with what its answer needs. 404 for
 * an id of another organisation, a missing thumbnail, or an object the store no longer has.
 */
export async function getEvidenceFile(organisationId: string, id: string, variant: 'original' | 'thumbnail') {
	const row = await db('evidence')
		.where({ organisation_id: organisationId, id })
		.first('name', 'content_type', 'storage_key', 'thumbnail_key');
	if (!row) throw new NotFoundError('No such evidence.');
	const key = variant === 'thumbnail' ? row.thumbnail_key : row.storage_key;
	if (!key) throw new NotFoundError('This evidence has no thumbnail: only photos have one.');
	const object = await getObject(key);
	if (!object) {
		console.error(`[evidence] the object of evidence ${id} (${variant}) is missing from the store`);
		throw new NotFoundError('The file of this evidence is missing from the store.');
	}
	const name = downloadName(row.name, row.content_type);
	return {
		body: object.body,
		bytes: object.bytes,
		contentType: variant === 'thumbnail' ? 'image/jpeg' : (row.content_type as string),
		filename: variant === 'thumbnail' ? `${name.replace(/\.[^.]+$/, '')}-thumbnail.jpg` : name
	};
}

/**
 * Delete evidence that is not yet listed in an issued report (409 once it is), with its objects; the
 * requests it answered are open again. Its uploader, the dwelling's assessor or an admin.
 */
export async function deleteEvidence(member: Member, id: string): Promise<void> {
	const org = member.organisationId;
	const removed = await db.transaction(async (t) => {
		// The lock issuing takes: a report being issued now either lists this evidence or never sees it.
		await t.raw('select pg_advisory_xact_lock(hashtext(?))', [`reports:${org}`]);
		const row = await evidenceQuery(t, org).andWhere('e.id', id).forUpdate('e').first();
		if (!row) throw new NotFoundError('No such evidence.');
		if (row.reported_at)
			throw new ConflictError(
				'This evidence is listed in an issued report of the dwelling, so it is kept with that record and cannot be deleted.'
			);
		if (!mayDelete(member, row))
			throw row.dwelling_status === 'archived'
				? new ConflictError('This dwelling is archived; restore it before changing its evidence.')
				: new ForbiddenError('Only its uploader, the dwelling’s assessor or an admin deletes evidence.');
		const reopened: { id: string; audit_item_id: string }[] = await t('evidence_requests')
			.where({ organisation_id: org, answer_evidence_id: id })
			.update({ answered_at: null, answered_by: null, answer_evidence_id: null })
			.returning(['id', 'audit_item_id']);
		for (const r of reopened)
			await logRequest(t, member, r.audit_item_id, 'evidence-reopen', { requestId: r.id, evidenceId: id });
		await t('evidence').where({ organisation_id: org, id }).delete();
		await logActivity(
			{
				organisationId: org,
				userId: member.user.id,
				action: 'delete',
				entity: 'evidence',
				entityId: id,
				details: { dwellingId: row.dwelling_id, name: row.name, sha256: row.sha256 }
			},
			t
		);
		return row;
	});
	await deleteObjectsQuietly([removed.storage_key, removed.thumbnail_key]);
}

/* ------------------------------------------------------------------ requests */

/** An entry in the audit item's history (the item page lists the log of its item). */
const logRequest = (t: Db, member: Member, itemId: string, action: string, details: object) =>
	logActivity(
		{
			organisationId: member.organisationId,
			userId: member.user.id,
			action,
			entity: 'audit_item',
			entityId: itemId,
			details: details as Record<string, unknown>
		},
		t
	);

async function lockItem(t: Db, organisationId: string, itemId: string) {
	const item = await t('audit_items as i')
		.join('audit_batches as b', 'b.id', 'i.batch_id')
		.where({ 'i.organisation_id': organisationId, 'i.id': itemId })
		.forShare('i')
		.first('i.id', 'i.dwelling_id', 'b.status as batch_status');
	if (!item) throw new NotFoundError('No such audit item.');
	return item as { id: string; dwelling_id: string; batch_status: string };
}

/** A supervisor (or admin) asks for evidence on an audit item: what, and by when. */
export async function requestEvidence(
	member: Member,
	itemId: string,
	raw: unknown
): Promise<EvidenceRequest> {
	if (!DECIDER_ROLES.includes(member.role))
		throw new ForbiddenError('Only supervisors and admins request evidence.');
	const input = parseWith(evidenceRequestSchema, raw, 'evidence request');
	const id = await db.transaction(async (t) => {
		const item = await lockItem(t, member.organisationId, itemId);
		if (item.batch_status === 'closed')
			throw new ConflictError('The batch is closed; reopen it to request evidence.');
		const [row] = await t('evidence_requests')
			.insert({
				organisation_id: member.organisationId,
				dwelling_id: item.dwelling_id,
				audit_item_id: itemId,
				requested_by: member.user.id,
				note: input.note,
				due_date: input.dueDate
			})
			.returning('id');
		await logRequest(t, member, itemId, 'evidence-request', {
			requestId: row.id,
			dwellingId: item.dwelling_id,
			note: input.note,
			dueDate: input.dueDate
		});
		return row.id as string;
	});
	return toRequest(await requestQuery(db, member.organisationId).andWhere('r.id', id).first());
}

/** Mark a request answered without a new upload, optionally naming evidence of the dwelling that answers it. */
export async function answerEvidenceRequest(
	member: Member,
	itemId: string,
	requestId: string,
	raw: unknown
): Promise<EvidenceRequest> {
	if (!ANSWER_ROLES.includes(member.role)) throw new ForbiddenError('Your role may not answer requests.');
	const input = parseWith(evidenceAnswerSchema, raw ?? {}, 'answer');
	const org = member.organisationId;
	await db.transaction(async (t) => {
		const req = await t('evidence_requests')
			.where({ organisation_id: org, id: requestId, audit_item_id: itemId })
			.forUpdate()
			.first();
		if (!req) throw new NotFoundError('No such evidence request on this audit item.');
		if (req.answered_at)
			throw new ConflictError(`This request was answered on ${calendarDay(req.answered_at)} already.`);
		const evidenceId = input.evidenceId ?? null;
		if (evidenceId) {
			const e = await t('evidence')
				.where({ organisation_id: org, dwelling_id: req.dwelling_id, id: evidenceId })
				.first('id');
			if (!e) throw new NotFoundError('No such evidence of this dwelling.');
		}
		await t('evidence_requests')
			.where({ organisation_id: org, id: requestId })
			.update({ answered_at: t.fn.now(), answered_by: member.user.id, answer_evidence_id: evidenceId });
		await logRequest(t, member, itemId, 'evidence-answer', { requestId, evidenceId, automatic: false });
	});
	return toRequest(await requestQuery(db, org).andWhere('r.id', requestId).first());
}

/* ------------------------------------------------------------------ the issued report */

export type EvidenceForReport = {
	name: string;
	sha256: string;
	contentType: EvidenceContentType;
	bytes: number;
	elementName: string | null;
	/** 0-based position in the element's build-up (print it as "layer N+1"), or null */
	layerIndex: number | null;
	layerName: string | null;
	uploadedAt: string;
};

/**
 * The dwelling's evidence as an issued report lists it (every piece, oldest first), read in the issuing
 * transaction `t`. Inserting the report marks these rows as reported (a trigger), after which they are
 * kept.
 */
export async function evidenceForReport(
	t: Db,
	organisationId: string,
	dwellingId: string
): Promise<EvidenceForReport[]> {
	const rows = await evidenceQuery(t, organisationId)
		.andWhere('e.dwelling_id', dwellingId)
		.orderBy([{ column: 'e.created_at' }, { column: 'e.id' }]);
	return rows.map((r) => ({
		name: r.name,
		sha256: r.sha256,
		contentType: r.content_type,
		bytes: Number(r.bytes),
		elementName: r.element_name ?? null,
		layerIndex: r.layer_index ?? null,
		layerName: r.layer_name ?? null,
		uploadedAt: iso(r.created_at)!
	}));
}
