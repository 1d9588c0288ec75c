// Evidence files through the API and the proxying routes, against PostgreSQL and a real S3 API (s3rver on
// loopback): type by content, the size limit, SHA-256, thumbnails, a store that cannot be reached, and
// files that never leave their organisation.
// Sources of the file signatures used: JPEG starts with the SOI marker FF D8 (ITU-T T.81, Annex B.1.1.2);
// PNG with its 8-byte signature (PNG specification, W3C / ISO/IEC 15948, §5.2); PDF with "%PDF-1.x"
// (ISO 32000-1:2008, §7.5.2); an ELF program with 7F 'E' 'L' 'F' (System V ABI, ELF header e_ident); a
// Windows program with "MZ" and "PE\0\0" at the offset in e_lfanew (Microsoft PE Format specification,
// "MS-DOS Stub" and "Signature"). SHA-256 (FIPS 180-4) is checked against GNU coreutils' sha256sum, an
// implementation outside the project. The rest is Envelo's own behaviour (common practice, no source).
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import sharp from 'sharp';
import { fileTypeFromBuffer } from 'file-type';
import { callHandler, fakeEvent, hasDatabase, makeTeam, tdb } from '../../factories';
import { makeDwelling, makeElement } from '../../factories-audit';
import { closedPort, multipart, startFakeS3 } from './s3';

type Team = Awaited<ReturnType<typeof makeTeam>>;
type TestMember = Team['assessor'];

/** The same bytes hashed by coreutils' sha256sum, read from standard input. */
const sha256sum = (bytes: Uint8Array) =>
	execFileSync('sha256sum', ['-'], { input: bytes }).toString().split(' ')[0];

/** A photo-like image of w × h pixels (sharp), as PNG or JPEG. */
const image = (format: 'png' | 'jpeg', w: number, h: number) =>
	sharp({ create: { width: w, height: h, channels: 3, background: { r: 180, g: 120, b: 60 } } })
		[format]()
		.toBuffer();

/** A one-page PDF written out by hand (ISO 32000-1 §7.5: header, objects, cross-reference, trailer). */
const PDF = Buffer.from(
	'%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n' +
		'2 0 obj << /Type /Pages /Kids [3 0 R] /Count 1 >> endobj\n' +
		'3 0 obj << /Type /Page /Parent 2 0 R /MediaBox [0 0 200 200] >> endobj\n' +
		'xref\n0 4\n0000000000 65535 f \n0000000009 00000 n \n0000000058 00000 n \n0000000115 00000 n \n' +
		'trailer << /Size 4 /Root 1 0 R >>\nstartxref\n186\n%%EOF\n'
);

/** The start of a 64-bit ELF program, padded. */
function elf(): Buffer {
	const b = Buffer.alloc(4096);
	Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]).copy(b);
	b.writeUInt16LE(2, 16); // e_type ET_EXEC
	b.writeUInt16LE(0x3e, 18); // e_machine x86-64
	return b;
}

/** The start of a Windows PE program: the MS-DOS header pointing at the PE signature. */
function pe(): Buffer {
	const b = Buffer.alloc(4096);
	b.write('MZ', 0, 'latin1');
	b.writeUInt32LE(0x80, 0x3c); // e_lfanew
	b.write('PE\0\0', 0x80, 'latin1');
	b.writeUInt16LE(0x8664, 0x84); // Machine: x64
	return b;
}

describe.skipIf(!hasDatabase)('evidence files (PostgreSQL and an S3 API)', () => {
	let s3: Awaited<ReturnType<typeof startFakeS3>>;
	let uploadRoute: typeof import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/evidence/+server');
	let fileRoute: typeof import('../../../src/routes/evidence/[evidenceId=uuid]/+server');
	let thumbRoute: typeof import('../../../src/routes/evidence/[evidenceId=uuid]/thumbnail/+server');
	let evidence: typeof import('../../../src/lib/server/evidence');

	beforeAll(async () => {
		s3 = await startFakeS3(); // the S3_* settings first, then the modules that read them
		uploadRoute = await import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/evidence/+server');
		fileRoute = await import('../../../src/routes/evidence/[evidenceId=uuid]/+server');
		thumbRoute = await import('../../../src/routes/evidence/[evidenceId=uuid]/thumbnail/+server');
		evidence = await import('../../../src/lib/server/evidence');
	});
	afterAll(async () => {
		await s3?.stop();
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	async function world() {
		const t = await makeTeam();
		const dwelling = await makeDwelling(t.org.id, t.assessor.id);
		return { ...t, dwelling };
	}

	/** POST /api/v1/dwellings/:id/evidence as the browser sends it; thrown errors come back as answers. */
	async function upload(
		as: TestMember,
		dwellingId: string,
		file: { name: string; bytes: Uint8Array } | null,
		fields: [string, string][] = [],
		headers: Record<string, string> = {}
	) {
		const path = `/api/v1/dwellings/${dwellingId}/evidence`;
		const request = multipart(`http://127.0.0.1${path}`, fields, file, headers);
		const event = { ...fakeEvent(as, path), request, params: { dwellingId } };
		try {
			const res = await uploadRoute.POST(event as never);
			return { status: res.status, json: await res.json() };
		} catch (e: any) {
			if (typeof e?.status === 'number') return { status: e.status as number, json: e.body };
			throw e;
		}
	}

	/** GET /evidence/:id (or its thumbnail) as a member: the status, headers and bytes. */
	async function fetchFile(as: TestMember, id: string, variant: 'original' | 'thumbnail' = 'original') {
		const path = variant === 'thumbnail' ? `/evidence/${id}/thumbnail` : `/evidence/${id}`;
		const event = { ...fakeEvent(as, path), params: { evidenceId: id } };
		try {
			const res = await (variant === 'thumbnail' ? thumbRoute : fileRoute).GET(event as never);
			return { status: res.status, headers: res.headers, bytes: Buffer.from(await res.arrayBuffer()) };
		} catch (e: any) {
			if (typeof e?.status === 'number')
				return { status: e.status as number, headers: new Headers(), bytes: Buffer.alloc(0), body: e.body };
			throw e;
		}
	}

	const rows = (dwellingId: string) => tdb()('evidence').where({ dwelling_id: dwellingId });
	const prefixOf = (w: { org: { id: string }; dwelling: { id: string } }) =>
		`evidence/${w.org.id}/${w.dwelling.id}/`;

	it('stores a PNG and a JPEG with a 320 px JPEG thumbnail each, a PDF without one; SHA-256 as sha256sum', async () => {
		const w = await world();
		const png = await image('png', 1200, 900);
		const jpeg = await image('jpeg', 640, 480);
		for (const [name, bytes, type] of [
			['insulation with tape.png', png, 'image/png'],
			['cavity fill.jpg', jpeg, 'image/jpeg'],
			['product data sheet.pdf', PDF, 'application/pdf']
		] as const) {
			const r = await upload(w.assessor, w.dwelling.id, { name, bytes });
			expect(r.status, JSON.stringify(r.json)).toBe(201);
			expect(r.json).toMatchObject({ name, contentType: type, bytes: bytes.length });
			expect(r.json.sha256).toBe(sha256sum(bytes));
			expect(r.json.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));

			// The original comes back byte for byte, private and never sniffed.
			const got = await fetchFile(w.supervisor, r.json.id);
			expect(got.status).toBe(200);
			expect(sha256sum(got.bytes)).toBe(r.json.sha256);
			expect(got.headers.get('content-type')).toBe(type);
			expect(got.headers.get('cache-control')).toBe('private, no-store');
			expect(got.headers.get('x-content-type-options')).toBe('nosniff');
			expect(got.headers.get('content-disposition')).toBe(
				`inline; filename="${name}"; filename*=UTF-8''${encodeURIComponent(name)}`
			);

			const thumb = await fetchFile(w.supervisor, r.json.id, 'thumbnail');
			if (type === 'application/pdf') {
				expect(r.json.thumbnailUrl).toBeNull();
				expect(thumb.status).toBe(404);
			} else {
				expect(r.json.thumbnailUrl).toBe(`/evidence/${r.json.id}/thumbnail`);
				expect(thumb.status).toBe(200);
				expect(thumb.headers.get('content-type')).toBe('image/jpeg');
				expect(await fileTypeFromBuffer(thumb.bytes)).toEqual({ ext: 'jpg', mime: 'image/jpeg' });
				// Longest side 320 px, proportions kept (both test images are 4:3).
				expect(await sharp(thumb.bytes).metadata()).toMatchObject({ width: 320, height: 240 });
			}
		}
		const stored = await rows(w.dwelling.id).orderBy('created_at');
		expect(stored.map((r) => [r.content_type, r.thumbnail_key !== null])).toEqual([
			['image/png', true],
			['image/jpeg', true],
			['application/pdf', false]
		]);
		expect(await s3.keys(prefixOf(w))).toHaveLength(5);
		const log = await tdb()('activity_log')
			.where({ organisation_id: w.org.id, entity: 'evidence' })
			.orderBy('id');
		expect(log.map((l) => [l.action, l.details.sha256])).toEqual(stored.map((r) => ['upload', r.sha256]));
	});

	it('refuses by content, whatever the name: an ELF or PE program named .jpg, a text file named .pdf', async () => {
		const w = await world();
		const cases: [string, Buffer, RegExp][] = [
			[
				'site photo.jpg',
				elf(),
				/although its name ends in \.jpg: its content is a program \(an ELF executable\)/
			],
			['site photo 2.jpg', pe(), /although its name ends in \.jpg: its content is a Windows program/],
			[
				'data sheet.pdf',
				Buffer.from('Mineral wool, declared lambda 0.035 W/(m·K)\n'.repeat(20)),
				/although its name ends in \.pdf: its content is none of these/
			]
		];
		for (const [name, bytes, why] of cases) {
			const r = await upload(w.assessor, w.dwelling.id, { name, bytes });
			expect(r.status, name).toBe(400);
			expect(r.json.message).toMatch(new RegExp(`^“${name}” is not a JPEG, PNG or PDF file`));
			expect(r.json.message).toMatch(why);
			expect(r.json.issues).toEqual([{ path: 'file', message: r.json.message }]);
		}
		expect(await rows(w.dwelling.id)).toHaveLength(0);
		expect(await s3.keys(prefixOf(w))).toEqual([]);
	});

	it('refuses a file over 15 MB with 413 as it streams, and a request that says it is larger before reading it', async () => {
		const w = await world();
		const big = Buffer.alloc(evidence.MAX_EVIDENCE_BYTES + 1);
		(await image('jpeg', 64, 48)).copy(big); // a real JPEG start, so the type passes and the size decides
		const r = await upload(w.assessor, w.dwelling.id, { name: 'huge.jpg', bytes: big });
		expect(r.status).toBe(413);
		expect(r.json.message).toMatch(
			/^“huge\.jpg” is larger than 15 MB, the most a single file of evidence may be/
		);

		const declared = await upload(
			w.assessor,
			w.dwelling.id,
			{ name: 'small.png', bytes: await image('png', 10, 10) },
			[],
			{ 'content-length': String(40_000_000) }
		);
		expect(declared.status).toBe(413);
		expect(declared.json.message).toMatch(/^The upload is 40\.0 MB; a file of evidence may be at most 15 MB/);

		// Exactly at the limit is accepted.
		const edge = Buffer.alloc(evidence.MAX_EVIDENCE_BYTES);
		PDF.copy(edge);
		expect((await upload(w.assessor, w.dwelling.id, { name: 'edge.pdf', bytes: edge })).status).toBe(201);
		expect((await rows(w.dwelling.id)).map((r) => r.name)).toEqual(['edge.pdf']);
	});

	it('leaves no row when the store cannot be reached (503), and no object when the row cannot be written', async () => {
		const w = await world();
		const png = await image('png', 40, 30);
		const endpoint = process.env.S3_ENDPOINT;
		process.env.S3_ENDPOINT = `http://127.0.0.1:${await closedPort()}`;
		try {
			const r = await upload(w.assessor, w.dwelling.id, { name: 'wall.png', bytes: png });
			expect(r.status).toBe(503);
			expect(r.json.message).toMatch(/file store for evidence cannot be reached just now; nothing was saved/);
		} finally {
			process.env.S3_ENDPOINT = endpoint;
		}
		expect(await rows(w.dwelling.id)).toHaveLength(0);
		expect(await tdb()('activity_log').where({ organisation_id: w.org.id, entity: 'evidence' })).toEqual([]);

		// The objects are stored, then the insert fails (an uploader the database does not know): both
		// objects are taken out again.
		const ghost = { ...w.assessor, id: '00000000-0000-4000-8000-00000000dead' as TestMember['id'] };
		const failing = await upload(ghost, w.dwelling.id, { name: 'wall.png', bytes: png }).catch((e) => e);
		expect(failing).toBeInstanceOf(Error);
		expect(String(failing.message)).toMatch(/evidence_uploaded_by_foreign/);
		expect(await rows(w.dwelling.id)).toHaveLength(0);
		expect(await s3.keys(prefixOf(w))).toEqual([]);
	});

	it('refuses an empty file, no file, a request that is not multipart, and fields after the file', async () => {
		const w = await world();
		const empty = await upload(w.assessor, w.dwelling.id, { name: 'empty.png', bytes: new Uint8Array() });
		expect(empty).toMatchObject({
			status: 400,
			json: { message: '“empty.png” is empty: nothing was saved.' }
		});
		const none = await upload(w.assessor, w.dwelling.id, null, [['elementId', '']]);
		expect(none).toMatchObject({ status: 400, json: { message: 'Choose a file to upload (field "file").' } });

		const path = `/api/v1/dwellings/${w.dwelling.id}/evidence`;
		const json = await callHandler(uploadRoute.POST, w.assessor, 'POST', path, {
			params: { dwellingId: w.dwelling.id },
			body: { file: 'x' }
		});
		expect(json.status).toBe(400);
		expect(json.json.message).toMatch(/^Send the file as multipart\/form-data in a field named "file"/);

		// The field order of a hand-made request: elementId after the file could not be used.
		const elementId = await makeElement(w.org.id, w.dwelling.id, { name: 'Wall' });
		const fd = new FormData();
		fd.append('file', new Blob([await image('png', 8, 8)]), 'late.png');
		fd.append('elementId', elementId);
		const request = new Request(`http://127.0.0.1${path}`, { method: 'POST', body: fd });
		const late = await uploadRoute.POST({
			...fakeEvent(w.assessor, path),
			request,
			params: { dwellingId: w.dwelling.id }
		} as never);
		expect(late.status).toBe(400);
		expect((await late.json()).message).toMatch(/elementId came after the file and could not be used/);
		expect(await rows(w.dwelling.id)).toHaveLength(0);
		expect(await s3.keys(prefixOf(w))).toEqual([]);
	});

	it("answers 404 to another organisation's member for the file, the thumbnail, the list and an upload", async () => {
		const w = await world();
		const other = await makeTeam();
		const r = await upload(w.assessor, w.dwelling.id, {
			name: 'loft.png',
			bytes: await image('png', 100, 80)
		});
		expect(r.status).toBe(201);
		const id = r.json.id as string;
		for (const who of [other.admin, other.assessor, other.supervisor]) {
			const file = await fetchFile(who, id);
			expect(file.status).toBe(404);
			expect(file.bytes).toHaveLength(0);
			expect((await fetchFile(who, id, 'thumbnail')).status).toBe(404);
			const list = await callHandler(
				uploadRoute.GET,
				who,
				'GET',
				`/api/v1/dwellings/${w.dwelling.id}/evidence`,
				{ params: { dwellingId: w.dwelling.id } }
			);
			expect(list.status).toBe(404);
			expect(list.text).not.toContain(id);
			expect(list.text).not.toContain(w.dwelling.id);
		}
		const intoOther = await upload(other.assessor, w.dwelling.id, {
			name: 'x.png',
			bytes: await image('png', 8, 8)
		});
		expect(intoOther.status).toBe(404);
		// Their own members see it; a supervisor reads but does not upload.
		expect((await fetchFile(w.supervisor, id)).status).toBe(200);
		const list = await callHandler(
			uploadRoute.GET,
			w.supervisor,
			'GET',
			`/api/v1/dwellings/${w.dwelling.id}/evidence`,
			{
				params: { dwellingId: w.dwelling.id }
			}
		);
		expect(list.json.items.map((e: { id: string }) => e.id)).toEqual([id]);
		const bySupervisor = await upload(w.supervisor, w.dwelling.id, {
			name: 'y.png',
			bytes: await image('png', 8, 8)
		});
		expect(bySupervisor.status).toBe(403);
	});

	it('makes file names safe to store and to send back', () => {
		expect(evidence.safeFileName('../../etc/passwd')).toBe('passwd');
		expect(evidence.safeFileName('C:\\Users\\ben\\wall "north".jpg')).toBe('wall _north_.jpg');
		expect(evidence.safeFileName('a\u0000b\r\nc.png')).toBe('a_b__c.png');
		expect(evidence.safeFileName('...')).toBe('evidence');
		expect(evidence.safeFileName('x'.repeat(300) + '.pdf')).toHaveLength(150);
		expect(evidence.downloadName('scan', 'application/pdf')).toBe('scan.pdf');
		expect(evidence.downloadName('photo.JPEG', 'image/jpeg')).toBe('photo.JPEG');
		// RFC 8187: the UTF-8 name percent-encoded, an ASCII fallback without quotes.
		expect(evidence.contentDisposition('attachment', 'Dämmung (Nord).jpg')).toBe(
			`attachment; filename="D_mmung (Nord).jpg"; filename*=UTF-8''D%C3%A4mmung%20%28Nord%29.jpg`
		);
	});
});
