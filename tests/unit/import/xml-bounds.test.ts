import { describe, expect, it } from 'vitest';
import { refusal } from '../../helpers/refusal';
import { PANEL_XML } from '../../helpers/gdtf';
import { parseGdtfXml } from '../../../src/lib/server/import/gdtf';
import { boundXml, XML_LIMITS } from '../../../src/lib/server/import/limits';

// Issue 20: description.xml is measured (elements, depth, attributes, attribute length) before the
// XML parser allocates anything for it. Markup rules: W3C XML 1.0 §2.5 comments, §2.7 CDATA, §3.1
// start tags and attributes (quoted with " or ').

const small = { elements: 5, depth: 3, attributesPerElement: 2, attributes: 4, attributeLength: 8 } as const;

describe('XML bounds before parsing', () => {
	it('lets the shape of a real fixture type through at the default limits', () => {
		expect(() => boundXml(PANEL_XML)).not.toThrow();
		expect(parseGdtfXml(PANEL_XML).type.modes).toHaveLength(3);
	});

	it('counts elements, refusing the first past the bound', () => {
		expect(() => boundXml('<a><b/><b/><b/><b/></a>', small)).not.toThrow();
		expect(refusal(() => boundXml('<a><b/><b/><b/><b/><b/></a>', small))).toMatchObject({
			status: 413,
			code: 'xml-elements'
		});
	});

	it('measures depth by open minus closed elements; self-closing ones do not nest', () => {
		expect(() => boundXml('<a><b><c/><c/></b><b><c></c></b></a>', { ...small, elements: 7 })).not.toThrow();
		const deep = refusal(() => boundXml('<a><b><c><d/></c></b></a>', { ...small, depth: 2 }));
		expect(deep).toMatchObject({ status: 400, code: 'xml-depth' });
		expect(deep.message).toContain('more than 2 deep');
	});

	it('counts attributes per element and in the whole document', () => {
		expect(() => boundXml('<a x="1" y=\'2\'><b p = "3" q="4"/></a>', small)).not.toThrow();
		expect(refusal(() => boundXml('<a x="1" y="2" z="3"/>', small)).code).toBe('xml-attributes');
		const total = refusal(() => boundXml('<a x="1" y="2"><b p="3" q="4"/><b r="5"/></a>', small));
		expect(total.message).toContain('more than 4 attributes');
	});

	it('measures each attribute value, however it is quoted', () => {
		expect(() => boundXml('<a x="12345678" y=\'12345678\'/>', small)).not.toThrow();
		const long = refusal(() => boundXml("<a x='123456789'/>", small));
		expect(long).toMatchObject({ status: 413, code: 'xml-attribute-length' });
		expect(long.message).toContain('9 characters long; at most 8');
	});

	it('does not count markup inside comments, CDATA, processing instructions or quoted values', () => {
		const text =
			'<?xml version="1.0"?><a><!-- <b/><b/><b/><b/><b/> --><![CDATA[<b x="1" y="2" z="3"/>]]><b x="<c/>"/></a>';
		expect(() => boundXml(text, small)).not.toThrow();
	});

	it('refuses a fixture type carrying two million attributes before parsing it', () => {
		const attrs: string[] = [];
		for (let i = 0; i < 2_000_000; i++) attrs.push(`a${i}=""`);
		const xml = PANEL_XML.replace('<FixtureType ', `<FixtureType ${attrs.join(' ')} `);
		const e = refusal(() => parseGdtfXml(xml));
		expect(e).toMatchObject({ status: 413, code: 'xml-attributes' });
		expect(e.message).toContain(`more than ${XML_LIMITS.attributesPerElement} attributes`);
	});

	it('refuses one 20 MB attribute before parsing it', () => {
		const xml = PANEL_XML.replace(
			'Description="An invented soft panel."',
			`Description="${'x'.repeat(20 * 1024 * 1024)}"`
		);
		const e = refusal(() => parseGdtfXml(xml));
		expect(e).toMatchObject({ status: 413, code: 'xml-attribute-length' });
		expect(e.message).toContain('20,971,520 characters long');
	});
});
