/** Checks of the library revisions the layers name: in the library, verified, current, declared, and copied faithfully. */
import type { Flag } from '$lib/audit/flags';
import type { RevisionInfo } from '$lib/audit/types';
import { different } from '$lib/audit/compare';
import { layerFlag, type LayerContext } from './context';

const codeOf = (rev: RevisionInfo) => (rev.code ? `${rev.code} ` : '');

/**
 * `material-unverified`: a layer that names a library revision the library does not hold, so its values
 * cannot be traced to a source (common practice, no source).
 */
export function revisionMissing(l: LayerContext): Flag[] {
	if (!l.layer.materialRevisionId || l.rev) return [];
	return [
		layerFlag(
			l,
			'material-unverified',
			'medium',
			`${l.at} names a library revision that is not in the library.`
		)
	];
}

/**
 * `material-superseded`: a layer that uses a revision marked superseded, or one that is no longer its
 * material's current revision; names the current one when there is one (common practice, no source).
 */
export function revisionSuperseded(l: LayerContext): Flag[] {
	const { rev, current: cur } = l;
	if (!rev || !(rev.status === 'superseded' || (cur && cur.id !== rev.id))) return [];
	const now =
		cur && cur.id !== rev.id
			? `; the current revision is ${cur.revision}${cur.lambda !== null ? ` (λ ${cur.lambda})` : ''}`
			: '';
	return [
		layerFlag(
			l,
			'material-superseded',
			'medium',
			`${l.at} uses ${codeOf(rev)}revision ${rev.revision}${rev.lambda !== null ? ` (λ ${rev.lambda})` : ''}, which has been superseded${now}.`
		)
	];
}

/**
 * `values-differ-from-revision`: a layer linked to a revision whose λ (or R, for a revision given by
 * its resistance) or μ was changed by hand; air layers take no λ or R from the library. Floating-point
 * noise does not count (`different`). Common practice, no source.
 */
export function valuesDifferFromRevision(l: LayerContext): Flag[] {
	const { rev, layer } = l;
	if (!rev) return [];
	const diffs: string[] = [];
	if (!layer.air && rev.lambda !== null && different(layer.lambda, rev.lambda))
		diffs.push(`λ ${layer.lambda} instead of ${rev.lambda}`);
	if (
		!layer.air &&
		rev.lambda === null &&
		rev.resistance !== null &&
		different(layer.resistance, rev.resistance)
	)
		diffs.push(`R ${layer.resistance} instead of ${rev.resistance}`);
	if (rev.muDry !== null && different(layer.mu, rev.muDry))
		diffs.push(`μ ${layer.mu} instead of ${rev.muDry}`);
	if (!diffs.length) return [];
	return [
		layerFlag(
			l,
			'values-differ-from-revision',
			'medium',
			`${l.at}: ${diffs.join(', ')} of ${codeOf(rev)}revision ${rev.revision}; the entered values were changed by hand.`
		)
	];
}

/** Where in the dwelling one library revision is used: the first element, and every layer by name. */
export type RevisionUses = Map<string, { rev: RevisionInfo; elementId: string; places: string[] }>;

/**
 * The revisions a dwelling's layers use that deserve one flag each, however often they are used:
 * unverified ones, and insulation with a generic table λ.
 */
export type LibraryUses = { unverified: RevisionUses; generic: RevisionUses };

export const newLibraryUses = (): LibraryUses => ({ unverified: new Map(), generic: new Map() });

function note(m: RevisionUses, rev: RevisionInfo, elementId: string, place: string) {
	const e = m.get(rev.id) ?? { rev, elementId, places: [] };
	e.places.push(place);
	m.set(rev.id, e);
}

/** Record a layer's revision among the dwelling's unverified or generic-λ uses. */
export function noteUse(uses: LibraryUses, l: LayerContext): void {
	const rev = l.rev;
	if (!rev) return;
	const el = l.element.element;
	const place = `${el.name} layer ${l.index + 1}`;
	if (rev.status === 'unverified') note(uses.unverified, rev, el.id, place);
	if (rev.category === 'insulation' && rev.lambdaKind === 'table') note(uses.generic, rev, el.id, place);
}

const where = (p: string[]) =>
	p.length === 1 ? p[0] : `${p.slice(0, -1).join(', ')} and ${p[p.length - 1]}`;

/**
 * `material-unverified`: one flag per library revision not yet verified against its source, naming
 * every layer of the dwelling that uses it (common practice, no source).
 */
export function unverifiedRevisions(uses: RevisionUses): Flag[] {
	return [...uses.values()].map(({ rev, elementId, places }): Flag => ({
		code: 'material-unverified',
		severity: 'medium',
		elementId,
		reason: `${codeOf(rev)}"${rev.name}" revision ${rev.revision}, used in ${where(places)}, has not been verified against its source.`
	}));
}

/**
 * `generic-lambda`: one flag per insulation revision that carries a generic table λ, naming every
 * layer that uses it: an insulation product is expected to carry the declared λ of its documentation
 * (common practice, no source).
 */
export function genericLambdas(uses: RevisionUses): Flag[] {
	return [...uses.values()].map(({ rev, elementId, places }): Flag => ({
		code: 'generic-lambda',
		severity: 'low',
		elementId,
		reason: `${codeOf(rev)}"${rev.name}", used in ${where(places)}, carries a generic table λ (${rev.lambda} W/(m·K)) for an insulation product; a declared value from the product's documentation is expected.`
	}));
}
