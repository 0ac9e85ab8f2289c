import { fail } from '@sveltejs/kit';
import { asc, desc } from 'drizzle-orm';
import { STEERING_ROLES } from '$lib/domain/auth/roles';
import { getDb } from '$lib/server/db';
import { coreLot, turboModel } from '$lib/server/db/schema';
import {
	cardUnits,
	createCard,
	listCards,
	moveUnitsToCard,
	parseSerials,
	recentCardChanges,
	setCardOpen,
	updateCard,
	type CardInput
} from '$lib/server/cards';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const db = getDb();
	const open = listCards(db, true);
	return {
		cards: open,
		closed: listCards(db, false),
		units: Object.fromEntries(open.filter((c) => c.kind === 'units').map((c) => [c.id, cardUnits(db, c.id, 200)])),
		models: db.select({ code: turboModel.code }).from(turboModel).orderBy(asc(turboModel.code)).all().map((m) => m.code),
		lots: db.select({ code: coreLot.code }).from(coreLot).orderBy(desc(coreLot.receivedOn)).limit(200).all().map((l) => l.code),
		log: recentCardChanges(db, 15),
		canEdit: STEERING_ROLES.includes(locals.user!.role)
	};
};

function str(form: FormData, name: string): string {
	const v = form.get(name);
	return typeof v === 'string' ? v.slice(0, 20_000) : '';
}

function cardInput(form: FormData): CardInput {
	return {
		title: str(form, 'title'),
		dueOn: str(form, 'dueOn'),
		style: str(form, 'style') as CardInput['style'],
		kind: str(form, 'kind') as CardInput['kind'],
		ruleModel: str(form, 'ruleModel'),
		ruleStage: str(form, 'ruleStage') as CardInput['ruleStage'],
		ruleLot: str(form, 'ruleLot'),
		serials: str(form, 'serials')
	};
}

function idOf(form: FormData, name = 'id'): number {
	const n = Number(str(form, name));
	return Number.isInteger(n) && n > 0 ? n : 0;
}

function actorOf(locals: App.Locals) {
	const u = locals.user!;
	return { id: u.id, role: u.role };
}

export const actions: Actions = {
	create: async ({ request, locals }) => {
		const form = await request.formData();
		const values = cardInput(form);
		const r = createCard(getDb(), actorOf(locals), values);
		if (!r.ok) return fail(r.status, { action: 'create', message: r.message, fields: r.fields ?? {}, values });
		return { action: 'create', done: `Card “${r.card.title}” is on the board at ${r.card.rank}.` };
	},
	update: async ({ request, locals }) => {
		const form = await request.formData();
		const values = cardInput(form);
		const r = updateCard(getDb(), actorOf(locals), idOf(form), Number(str(form, 'version')), values);
		if (!r.ok) return fail(r.status, { action: 'update', message: r.message, fields: r.fields ?? {}, values, current: r.current ?? null });
		return { action: 'update', done: `Saved “${r.card.title}”.` };
	},
	close: async ({ request, locals }) => {
		const form = await request.formData();
		const r = setCardOpen(getDb(), actorOf(locals), idOf(form), Number(str(form, 'version')), false);
		if (!r.ok) return fail(r.status, { action: 'close', message: r.message, current: r.current ?? null });
		return { action: 'close', done: `Closed “${r.card.title}”; it no longer orders the queues.` };
	},
	reopen: async ({ request, locals }) => {
		const form = await request.formData();
		const r = setCardOpen(getDb(), actorOf(locals), idOf(form), Number(str(form, 'version')), true);
		if (!r.ok) return fail(r.status, { action: 'reopen', message: r.message, current: r.current ?? null });
		return { action: 'reopen', done: `Reopened “${r.card.title}” at the bottom of the board.` };
	},
	move: async ({ request, locals }) => {
		const form = await request.formData();
		const serials = [...form.getAll('serial').filter((v): v is string => typeof v === 'string'), ...parseSerials(str(form, 'more'))];
		const to = str(form, 'to');
		const target = to === 'none' ? null : Number(to);
		if (target !== null && !(Number.isInteger(target) && target > 0)) return fail(400, { action: 'move', message: 'Choose the card to move the units to.' });
		const r = moveUnitsToCard(getDb(), actorOf(locals), serials, target);
		if (!r.ok) return fail(r.status, { action: 'move', message: r.message });
		return { action: 'move', done: r.moved ? `Moved ${r.moved} unit${r.moved === 1 ? '' : 's'}.` : 'Those units were already there.' };
	}
};
