import { describe, expect, it } from 'vitest';
import { isVerificationCode, MAX_PDF_BYTES, pdfCheckFromForm } from '$lib/reports/forms';
import { normaliseCode } from '$lib/server/reports';

// The public verification forms (Envelo's own code format: ten letters and digits, common practice,
// no source). The hash below only needs to be 64 hexadecimal digits; it is the SHA-256 of no bytes at
// all (from memory).
const EMPTY_SHA256 = 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855';

describe('verification code box', () => {
	it('takes the grouped form printed on a report', () => {
		expect(isVerificationCode(normaliseCode('k7qm-2xpd-9r'))).toBe(true);
	});
	it('refuses a code of the wrong length', () => {
		expect(isVerificationCode(normaliseCode('K7QM-2XPD'))).toBe(false);
		expect(isVerificationCode(normaliseCode(''))).toBe(false);
	});
});

describe('PDF check form', () => {
	it('takes a hash worked out in the browser, in lower case', () => {
		expect(pdfCheckFromForm({ sha256: EMPTY_SHA256.toUpperCase(), name: 'report.pdf' })).toEqual({
			hash: EMPTY_SHA256,
			name: 'report.pdf'
		});
	});
	it('refuses a hash that is not 64 hexadecimal digits', () => {
		expect(pdfCheckFromForm({ sha256: 'abc', name: '' })).toEqual({
			error: 'The file could not be read. Choose the PDF again.'
		});
	});
	it('asks for a file when none is given, and refuses one over 20 MB', () => {
		expect(pdfCheckFromForm({ sha256: '', name: '' })).toEqual({
			error: 'Choose the PDF file you received.'
		});
		const big = new File([new Uint8Array(MAX_PDF_BYTES + 1)], 'big.pdf');
		expect(pdfCheckFromForm({ pdf: big, sha256: '', name: '' })).toEqual({
			error: 'The file is larger than 20 MB: it is not a report issued here.'
		});
		const pdf = new File([new TextEncoder().encode('%PDF-1.7')], 'a.pdf');
		expect(pdfCheckFromForm({ pdf, sha256: '', name: '' })).toEqual({ file: pdf });
	});
});
