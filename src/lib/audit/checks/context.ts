/** What the audit's checks look at, and how their flags name an element or a layer. */
import { ELEMENT_KIND_LABELS, type ElementKind } from '$lib/dwellings/kinds';
import type { StoredLayer } from '$lib/dwellings/element-input';
import type { Flag, FlagCode, Severity } from '$lib/audit/flags';
import type {
	AuditElement,
	AuditReport,
	LimitTableInfo,
	RevisionInfo,
	SnapshotElement
} from '$lib/audit/types';

/** One element of the dwelling, with its record in the issued report and its limit. */
export type ElementContext = {
	element: AuditElement;
	/** the element as the latest issued report recorded it; undefined when it is not in the report */
	snapshot: SnapshotElement | undefined;
	report: AuditReport | null;
	/** the limit for the element's kind, W/(m²·K), from the dwelling's limit table */
	limit: number | null;
	/** "name edition" of the limit table, for messages */
	tableName: string | null;
	/** how messages name the element: "Name (Kind)" */
	at: string;
};

/** One layer of an element's build-up, with its library revisions. */
export type LayerContext = {
	element: ElementContext;
	index: number;
	layer: StoredLayer;
	/** the revision the layer names, when it is in the library */
	rev: RevisionInfo | undefined;
	/** the current revision of the layer's material */
	current: RevisionInfo | undefined;
	/** how messages name the layer: `Name (Kind), layer 2 "PIR board"` */
	at: string;
};

export const kindLabel = (k: string) => ELEMENT_KIND_LABELS[k as ElementKind] ?? k;
export const fmtU = (u: number) => u.toFixed(3);

/** How messages name a limit table: its name and edition; null without a table. */
export function limitTableName(t: LimitTableInfo | null): string | null {
	return t ? `${t.name} ${t.edition}`.trim() : null;
}

export function elementContext(
	el: AuditElement,
	snapshot: SnapshotElement | undefined,
	report: AuditReport | null,
	limitTable: LimitTableInfo | null
): ElementContext {
	const limits = limitTable?.limits ?? {};
	return {
		element: el,
		snapshot,
		report,
		limit: typeof limits[el.kind] === 'number' ? limits[el.kind]! : null,
		tableName: limitTableName(limitTable),
		at: `${el.name} (${kindLabel(el.kind)})`
	};
}

export function layerContext(
	element: ElementContext,
	index: number,
	layer: StoredLayer,
	rev: RevisionInfo | undefined,
	current: RevisionInfo | undefined
): LayerContext {
	return { element, index, layer, rev, current, at: `${element.at}, layer ${index + 1} "${layer.name}"` };
}

/** A flag on an element. */
export function elementFlag(ctx: ElementContext, code: FlagCode, severity: Severity, reason: string): Flag {
	return { code, severity, elementId: ctx.element.id, reason };
}

/** A flag on one layer of an element. */
export function layerFlag(l: LayerContext, code: FlagCode, severity: Severity, reason: string): Flag {
	return { code, severity, elementId: l.element.element.id, layerIndex: l.index, reason };
}

const INSULATION_WORDS =
	/insulation|wool|fibre|fiber|quilt|batt|\bpir\b|\bpur\b|\beps\b|\bxps\b|phenolic|cellulose|foam/i;

/**
 * Whether a layer is insulation: its library revision's category, else words in its name (common
 * practice, no source: the usual names of insulation products).
 */
export function looksLikeInsulation(layer: StoredLayer, rev: RevisionInfo | undefined): boolean {
	if (rev) return rev.category === 'insulation';
	return INSULATION_WORDS.test(layer.name ?? '');
}
