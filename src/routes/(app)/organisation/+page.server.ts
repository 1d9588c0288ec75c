import { fail } from '@sveltejs/kit';
import { message } from 'sveltekit-superforms';
import { formFor, readForm, refuseAction, refuseForm } from '$lib/server/forms';
import { requireMember, requireRole } from '$lib/server/guard';
import { changeMemberRole, inviteMember, listMembers, removeMember } from '$lib/server/members';
import { appUrl } from '$lib/server/config';
import { sendMail } from '$lib/server/mail';
import { inviteSchema, removeSchema, roleSchema } from '$lib/members/forms';

export const load = async (event) => {
	const member = requireMember(event);
	return {
		members: await listMembers(member.organisationId),
		inviteForm: await formFor(inviteSchema, { email: '', name: '', role: 'assessor' })
	};
};

export const actions = {
	invite: async function invite(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, inviteSchema);
		if (!form.valid) return fail(400, { inviteForm: form });
		let outcome: 'invited' | 'elsewhere';
		try {
			({ outcome } = await inviteMember(
				{ userId: member.user.id, organisationId: member.organisationId },
				form.data
			));
		} catch (e) {
			// the service's refusals are of the address (already a member, or of another organisation)
			return refuseForm(form, e, { field: () => 'email', text: (r) => r.message });
		}
		const signInUrl = appUrl('/signin');
		const inviter = member.user.name ?? member.user.email;
		// The admin's answer is the same either way; the person learns why they were not added.
		const mail =
			outcome === 'invited'
				? {
						subject: `You are invited to ${member.organisationName} on Envelo`,
						text:
							`${inviter} has added you to ${member.organisationName} on Envelo as ${form.data.role}.\n\n` +
							`Sign in with this address at ${signInUrl} — Envelo e-mails you a link each time; there is no password.\n`
					}
				: {
						subject: `An invitation to ${member.organisationName} on Envelo`,
						text:
							`${inviter} tried to add you to ${member.organisationName} on Envelo, but this address already belongs to another organisation there, and one address belongs to one organisation.\n\n` +
							`If you want to join ${member.organisationName}, reply to ${inviter} with another address to invite. Nothing has changed for your current organisation.\n`
					};
		try {
			await sendMail({ to: form.data.email.toLowerCase(), ...mail });
		} catch {
			return message(
				form,
				`Added ${form.data.email}, but the invitation e-mail could not be sent; tell them to sign in at ${signInUrl}.`
			);
		}
		return message(form, `Invitation sent to ${form.data.email}.`);
	},
	role: async function setRole(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, roleSchema);
		if (!form.valid) return fail(400, { error: 'Choose a member and a role.' });
		try {
			await changeMemberRole(
				{ userId: member.user.id, organisationId: member.organisationId },
				form.data.userId,
				form.data.role
			);
		} catch (e) {
			return refuseAction(e, (r) => r.message);
		}
		return { done: 'Role changed.' };
	},
	remove: async function remove(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, removeSchema);
		if (!form.valid) return fail(400, { error: 'Unknown member.' });
		try {
			await removeMember({ userId: member.user.id, organisationId: member.organisationId }, form.data.userId);
		} catch (e) {
			return refuseAction(e, (r) => r.message);
		}
		return { done: 'Member removed.' };
	}
};
