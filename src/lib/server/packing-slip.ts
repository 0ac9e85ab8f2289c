/** The printable packing slip for a shipment, as a PDF (pdf-lib, standard Helvetica). */
import { PDFDocument, StandardFonts, rgb } from 'pdf-lib';
import type { shipmentDetail } from './shipments';

type Detail = NonNullable<ReturnType<typeof shipmentDetail>>;

/** pdf-lib's standard fonts encode WinAnsi only: keep to printable Latin-1. */
function plain(s: string): string {
	return s.replace(/[\u2012-\u2015\u2212]/g, '-').replace(/[^\x20-\x7e\xa0-\xff]/g, '?');
}

export async function packingSlipPdf(detail: Detail, shopName: string): Promise<Uint8Array> {
	const doc = await PDFDocument.create();
	doc.setTitle(`Packing slip ${detail.shipment.code}`);
	doc.setAuthor(plain(shopName));
	doc.setCreator('Spoolyard');
	const font = await doc.embedFont(StandardFonts.Helvetica);
	const bold = await doc.embedFont(StandardFonts.HelveticaBold);
	const A4: [number, number] = [595.28, 841.89];
	let page = doc.addPage(A4);
	let y = 800;
	const left = 50;
	const text = (s: string, x: number, size = 10, f = font) => page.drawText(plain(s), { x, y, size, font: f, color: rgb(0.1, 0.12, 0.14) });

	text(plain(shopName), left, 16, bold);
	y -= 22;
	text(`Packing slip ${detail.shipment.code}`, left, 13, bold);
	y -= 16;
	text(`Date: ${detail.shipment.createdAt.slice(0, 10)}   Carrier: ${detail.shipment.carrier}   Tracking: ${detail.shipment.trackingNumber}`, left);
	y -= 14;
	if (detail.orderCode) {
		text(`Rebuild order: ${detail.orderCode}`, left);
		y -= 14;
	}
	if (detail.shipment.reference) {
		text(`Web order: ${detail.shipment.reference}`, left);
		y -= 14;
	}
	y -= 6;
	text('Ship to', left, 10, bold);
	y -= 14;
	for (const line of detail.shipment.shipTo.split('\n')) {
		text(line, left);
		y -= 13;
	}
	y -= 10;
	const cols = [left, 130, 210, 420];
	const header = () => {
		['Serial', 'Model', 'Description', 'Tag as received'].forEach((h, i) => text(h, cols[i], 9, bold));
		y -= 4;
		page.drawLine({ start: { x: left, y }, end: { x: 545, y }, thickness: 0.7, color: rgb(0.4, 0.4, 0.4) });
		y -= 12;
	};
	header();
	for (const u of detail.units) {
		if (y < 70) {
			page = doc.addPage(A4);
			y = 800;
			header();
		}
		text(u.serial, cols[0], 9);
		text(u.modelCode, cols[1], 9);
		text((u.unrepaired ? 'Returned unrepaired' : u.modelDescription).slice(0, 42), cols[2], 9);
		text(u.originalTag.slice(0, 24), cols[3], 9);
		y -= 13;
	}
	y -= 8;
	text(`${detail.units.length} unit${detail.units.length === 1 ? '' : 's'}`, left, 10, bold);
	y -= 18;
	text('Fit and run-in per the maker\'s data. Rotating parts and hot surfaces can hurt people.', left, 8);
	return doc.save();
}
