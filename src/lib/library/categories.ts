/** The categories a material belongs to, with their labels (the library's own grouping). */
export const MATERIAL_CATEGORIES = [
	'masonry',
	'concrete',
	'timber-boards',
	'insulation',
	'membranes',
	'plasters-linings',
	'air-layers',
	'other'
] as const;
export type MaterialCategory = (typeof MATERIAL_CATEGORIES)[number];
export const MATERIAL_CATEGORY_LABELS: Record<MaterialCategory, string> = {
	masonry: 'Masonry',
	concrete: 'Concrete',
	'timber-boards': 'Timber and boards',
	insulation: 'Insulation',
	membranes: 'Membranes',
	'plasters-linings': 'Plasters and linings',
	'air-layers': 'Air layers',
	other: 'Other'
};
