/**
 * Templates of the element's kind: listed on request, one taken as the build-up, or the build-up saved
 * as a new one. Kept by the editor, so the list and the typed name outlive a switch to a window and back.
 */
import type { StoredBuildUp } from '$lib/dwellings/element-input';
import { ELEMENT_KIND_LABELS, type ElementKind } from '$lib/dwellings/kinds';
import { issuesSummary } from './element-issues';

export type Template = { id: string; name: string; description: string | null; buildUp: StoredBuildUp };

export class TemplateShelf {
	/** the templates listed, null until asked for (and after one is used) */
	templates: Template[] | null = $state(null);
	message: string | null = $state(null);
	/** the name typed for a new template */
	name = $state('');
	saving = $state(false);

	async load(kind: ElementKind) {
		this.message = null;
		const res = await fetch(`/api/v1/templates?kind=${kind}`);
		if (!res.ok) {
			this.message = `Templates are not available (${res.status}).`;
			return;
		}
		this.templates = (await res.json()).items ?? [];
		if (!this.templates?.length)
			this.message = `No templates for ${ELEMENT_KIND_LABELS[kind].toLowerCase()} yet.`;
	}

	/** The template's build-up, for the element to take; the list closes. */
	take(t: Template): StoredBuildUp {
		this.templates = null;
		this.message = `Layers from “${t.name}”.`;
		return t.buildUp;
	}

	async save(kind: ElementKind, description: string, buildUp: StoredBuildUp | null) {
		this.saving = true;
		this.message = null;
		const res = await fetch('/api/v1/templates', {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({
				name: this.name.trim(),
				kind,
				description,
				// the floor's perimeter and area belong to this dwelling, not to the construction
				buildUp: buildUp ? { ...buildUp, ground: undefined } : null
			})
		});
		const out = await res.json().catch(() => ({}));
		this.message = res.ok
			? `Saved as template “${this.name.trim()}”.`
			: // the answer's message names fields by their paths; the page says it in the screen's words
				`Template not saved: ${out.issues?.length ? issuesSummary(out.issues) : (out.message ?? res.status)}`;
		if (res.ok) this.name = '';
		this.saving = false;
	}
}
