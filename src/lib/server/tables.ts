/**
 * The rows of Envelo's tables as PostgreSQL gives them to Knex (snake_case; `timestamptz` and `date` as
 * Date, bigint and numeric as numbers, see `db.ts`), for the queries that read whole rows
 * (`db<ClimateRow>('climates')`), instead of casts.
 * The columns are checked against the migrated schema by `tests/db/tables.test.ts`; a migration that
 * adds, drops or changes a column changes this file too. JSON columns whose shape a zod schema fixes on
 * the way in carry that type; the rest are `Json`, read through their schema.
 */
import type { ClimateMonthValues, StoredBuildUp, StoredInternal } from '$lib/dwellings/element-input';
import type { DwellingStatus, ElementKind } from '$lib/dwellings/kinds';
import type { Stage } from '$lib/dwellings/schema';
import type { HeatFlow } from '$lib/physics';
import type { MaterialCategory } from '$lib/library/categories';
import type { LambdaKind } from '$lib/library/schema';
import type { Role } from '$lib/members/roles';
import type { Decision } from '$lib/audit/flags';
import type { DimensionSystem, JunctionType, PsiSource } from '$lib/junctions/kinds';
import type { JunctionDetails } from '$lib/junctions/schema';
import type { JunctionCalculation } from '$lib/junctions/calculate';
import type { JunctionInput } from '$lib/physics/junction-schema';

/** A JSON column, before its schema has read it. */
export type Json = unknown;

/** `activity_log` */
export interface ActivityLogRow {
	id: number;
	organisation_id: string | null;
	user_id: string | null;
	action: string;
	entity: string;
	entity_id: string | null;
	details: Json;
	created_at: Date;
}

/** `audit_batches` */
export interface AuditBatchRow {
	id: string;
	organisation_id: string;
	name: string;
	filter: Json;
	sampling: Json;
	seed: string;
	status: 'open' | 'closed';
	progress: Json;
	created_by: string;
	created_at: Date;
	updated_at: Date;
}

/** `audit_items` */
export interface AuditItemRow {
	id: string;
	organisation_id: string;
	batch_id: string;
	dwelling_id: string;
	picked_because: string;
	flags: Json;
	recompute: Json | null;
	recomputed_at: Date | null;
	decision: Decision | null;
	comment: string | null;
	decided_by: string | null;
	decided_at: Date | null;
	resubmissions: number;
	created_at: Date;
	updated_at: Date;
}

/** `climates` */
export interface ClimateRow {
	id: string;
	organisation_id: string;
	name: string;
	source: string;
	illustrative: boolean;
	months: ClimateMonthValues[];
	created_at: Date;
	updated_at: Date;
	version: number;
}

/** `dwellings` */
export interface DwellingRow {
	id: string;
	organisation_id: string;
	reference: string;
	address: string;
	programme: string | null;
	client_name: string | null;
	client_email: string | null;
	assessor_id: string | null;
	stage: Stage;
	status: DwellingStatus;
	limit_table_id: string | null;
	climate_id: string | null;
	version: number;
	created_at: Date;
	updated_at: Date;
	issue_changes: number | null;
	reopened_at: Date | null;
	design_id: string | null;
	floor_area: number | null;
}

/** `elements` */
export interface ElementRow {
	id: string;
	organisation_id: string;
	dwelling_id: string;
	position: number;
	name: string;
	kind: ElementKind;
	area: number;
	heat_flow: HeatFlow;
	build_up: StoredBuildUp | null;
	given_u: number | null;
	given_u_source: string | null;
	climate_id: string | null;
	internal: StoredInternal | null;
	last_result: Json | null;
	engine_version: string | null;
	version: number;
	created_at: Date;
	updated_at: Date;
	result_u_value: number | null;
	result_u_rounded: number | null;
	result_moisture: string | null;
	result_surface_pass: boolean | null;
	inputs_md5: string | null;
	design_element_id: string | null;
	window_parts: Json | null;
}

/** `evidence` */
export interface EvidenceRow {
	id: string;
	organisation_id: string;
	dwelling_id: string;
	element_id: string | null;
	layer_index: number | null;
	layer_name: string | null;
	name: string;
	content_type: string;
	bytes: number;
	sha256: string;
	storage_key: string;
	thumbnail_key: string | null;
	uploaded_by: string;
	created_at: Date;
	reported_at: Date | null;
}

/** `evidence_requests` */
export interface EvidenceRequestRow {
	id: string;
	organisation_id: string;
	dwelling_id: string;
	audit_item_id: string;
	requested_by: string;
	note: string;
	due_date: Date;
	created_at: Date;
	answered_at: Date | null;
	answered_by: string | null;
	answer_evidence_id: string | null;
}

/** `import_mappings` */
export interface ImportMappingRow {
	id: string;
	organisation_id: string;
	kind: string;
	header_signature: string;
	mapping: Json;
	created_at: Date;
	updated_at: Date;
}

/** `junctions` */
export interface JunctionRow {
	id: string;
	organisation_id: string;
	dwelling_id: string;
	name: string;
	type: JunctionType;
	length_m: number;
	source: PsiSource;
	dimension_system: DimensionSystem;
	psi_entered: number | null;
	psi_source: string | null;
	model: JunctionInput | null;
	details: JunctionDetails | null;
	last_result: JunctionCalculation | null;
	engine_version: string | null;
	version: number;
	created_at: Date;
	updated_at: Date;
}

/** `limit_tables` */
export interface LimitTableRow {
	id: string;
	organisation_id: string;
	name: string;
	edition: string;
	dated: Date | null;
	source: string | null;
	is_default: boolean;
	limits: Partial<Record<ElementKind, number>>;
	created_at: Date;
	updated_at: Date;
	version: number;
}

/** `mail_outbox` */
export interface MailOutboxRow {
	id: string;
	organisation_id: string | null;
	dwelling_id: string | null;
	report_id: string | null;
	purpose: string;
	to_address: string;
	subject: string;
	body_text: string;
	body_html: string | null;
	attachments: Json;
	status: 'queued' | 'sent' | 'failed';
	attempts: number;
	last_error: string | null;
	next_attempt_at: Date;
	sent_at: Date | null;
	created_by: string | null;
	created_at: Date;
}

/** `material_move_items` */
export interface MaterialMoveItemRow {
	move_id: string;
	element_id: string;
	outcome: string;
	reason: string | null;
	from_revision: number | null;
	to_revision: number | null;
	version: number | null;
	created_at: Date;
}

/** `material_moves` */
export interface MaterialMoveRow {
	id: string;
	organisation_id: string;
	material_id: string;
	to_revision_id: string;
	requested_by: string | null;
	element_ids: string[];
	state: string;
	total: number;
	done: number;
	moved: number;
	already: number;
	skipped: number;
	failed: number;
	error: string | null;
	heartbeat_at: Date | null;
	created_at: Date;
	started_at: Date | null;
	finished_at: Date | null;
}

/** `material_reach_outcomes` */
export interface MaterialReachOutcomeRow {
	organisation_id: string;
	engine_version: string;
	input_key: string;
	u_value: number | null;
	u_rounded: number | null;
	moisture: string | null;
	surface_pass: boolean | null;
	error: string | null;
	created_at: Date;
}

/** `material_revisions` */
export interface MaterialRevisionRow {
	id: string;
	organisation_id: string;
	material_id: string;
	revision: number;
	name: string;
	manufacturer: string;
	category: MaterialCategory;
	lambda: number | null;
	lambda_kind: LambdaKind | null;
	resistance: number | null;
	mu_dry: number | null;
	mu_wet: number | null;
	sd: number | null;
	density: number | null;
	specific_heat: number | null;
	thickness_min_mm: number | null;
	thickness_max_mm: number | null;
	source: string | null;
	source_issued: Date | null;
	source_expires: Date | null;
	status: 'unverified' | 'verified' | 'superseded';
	verified_by: string | null;
	verified_at: Date | null;
	notes: string | null;
	created_by: string | null;
	created_at: Date;
	indicative: boolean;
}

/** `materials` */
export interface MaterialRow {
	id: string;
	organisation_id: string;
	code: string;
	current_revision_id: string | null;
	created_at: Date;
	updated_at: Date;
}

/** `memberships` */
export interface MembershipRow {
	id: string;
	organisation_id: string;
	user_id: string;
	role: Role;
	invited_by: string | null;
	created_at: Date;
}

/** `organisations` */
export interface OrganisationRow {
	id: string;
	name: string;
	slug: string;
	created_at: Date;
}

/** `reports` */
export interface ReportRow {
	id: string;
	organisation_id: string;
	number: string;
	revision: number;
	scope: 'element' | 'dwelling';
	dwelling_id: string;
	element_id: string | null;
	supersedes_id: string | null;
	snapshot: Json;
	engine_version: string;
	verification_code: string;
	sha256: string;
	pdf: Buffer;
	issued_by: string;
	issued_at: Date;
}

/** `sign_in_attempts` */
export interface SignInAttemptRow {
	id: number;
	email: string;
	client: string;
	created_at: Date;
}

/** `templates` */
export interface TemplateRow {
	id: string;
	organisation_id: string;
	name: string;
	kind: ElementKind;
	description: string | null;
	build_up: StoredBuildUp;
	created_by: string | null;
	created_at: Date;
	updated_at: Date;
	version: number;
}

/** `users` */
export interface UserRow {
	id: string;
	name: string | null;
	email: string;
	emailVerified: Date | null;
	image: string | null;
	registration_number: string | null;
	created_at: Date;
}

/** The organisation's reference records, which `lockRecord` in `db.ts` locks for a change. */
export interface ReferenceRows {
	climates: ClimateRow;
	limit_tables: LimitTableRow;
	templates: TemplateRow;
}
