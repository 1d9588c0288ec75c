import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { getDwelling } from '$lib/server/dwellings';
import { readIssueChanges } from '$lib/server/reports/changes';
import { answer } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

/** What differs between the dwelling now and its latest issued dwelling report, with who and when. */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const dwelling = await getDwelling(member.organisationId, event.params.dwellingId);
		if (!dwelling) throw new NotFoundError('No such dwelling.');
		return json(await readIssueChanges(member.organisationId, dwelling.id, dwelling.issueChanges));
	});
