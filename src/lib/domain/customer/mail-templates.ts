/**
 * The e-mails a customer gets: a subject, a plain-text body and an HTML body, from the
 * shop's name and the facts of the order. No images, no tracking pixels, no remote content.
 */
import type { NoticeKind } from './progress';

export interface NoticeFacts {
	shopName: string;
	customerName: string;
	orderCode: string;
	serial: string;
	/** The status link, when this e-mail carries one. */
	link?: string | null;
	quoteTotal?: string | null;
	carrier?: string | null;
	trackingNumber?: string | null;
	unrepaired?: boolean;
}

export interface RenderedMail {
	subject: string;
	text: string;
	html: string;
}

export function escapeHtml(s: string): string {
	return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

function paragraphs(kind: NoticeKind, f: NoticeFacts): string[] {
	switch (kind) {
		case 'received':
			return [
				`We have received your unit for rebuild order ${f.orderCode}. Its shop serial is ${f.serial}.`,
				'You can follow it through the shop at the link below; no account is needed. Keep the link to yourself: anyone who has it can see this order.'
			];
		case 'quote_ready':
			return [
				`We have taken your unit apart and checked it. The quote for order ${f.orderCode} is ready${f.quoteTotal ? `: ${f.quoteTotal}` : ''}.`,
				'Open your status page to read it and approve or decline it. We do not start work until you approve.'
			];
		case 'in_work':
			return [`Work on your unit (order ${f.orderCode}, serial ${f.serial}) has started.`];
		case 'shipped':
			return [
				f.unrepaired
					? `Your unit (order ${f.orderCode}, serial ${f.serial}) is on its way back to you, unrepaired, as you asked.`
					: `Your rebuilt unit (order ${f.orderCode}, serial ${f.serial}) has shipped.`,
				f.trackingNumber ? `Carrier: ${f.carrier ?? ''}. Tracking number: ${f.trackingNumber}.` : 'The tracking number follows on your status page.'
			];
	}
}

const SUBJECT: Record<NoticeKind, (f: NoticeFacts) => string> = {
	received: (f) => `${f.shopName}: we received your unit (${f.orderCode})`,
	quote_ready: (f) => `${f.shopName}: your quote is ready (${f.orderCode})`,
	in_work: (f) => `${f.shopName}: work has started (${f.orderCode})`,
	shipped: (f) => `${f.shopName}: your unit has shipped (${f.orderCode})`
};

export function renderNotice(kind: NoticeKind, f: NoticeFacts): RenderedMail {
	const paras = paragraphs(kind, f);
	const linkText = f.link ? `\n\nYour status page: ${f.link}\n(This link expires; ask us for a new one any time.)` : '';
	const text = `Hello ${f.customerName},\n\n${paras.join('\n\n')}${linkText}\n\n— ${f.shopName}\n`;
	const linkHtml = f.link
		? `<p><a href="${escapeHtml(f.link)}">Open your status page</a></p><p style="color:#555">${escapeHtml(f.link)}</p>`
		: '';
	const html =
		`<!doctype html><html><body style="font-family:Inter,Arial,sans-serif;color:#1a1e24;max-width:560px">` +
		`<p>Hello ${escapeHtml(f.customerName)},</p>` +
		paras.map((p) => `<p>${escapeHtml(p)}</p>`).join('') +
		linkHtml +
		`<p>— ${escapeHtml(f.shopName)}</p></body></html>`;
	return { subject: SUBJECT[kind](f), text, html };
}
