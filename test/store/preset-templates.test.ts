/**
 * The built-in region templates: every file validates, its curve computes, it says where its
 * values come from and when to adapt it, and the store serves it read-only.
 */
import {createHash} from 'node:crypto';
import {readdirSync, readFileSync} from 'node:fs';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {libraryTissue} from '../../src/engine/tissue-library.js';
import {parsePlanDocument, type PlanDocument} from '../../src/plan/plan-schema.js';
import {resolvePlan} from '../../src/plan/resolve-plan.js';
import {openPresetStore} from '../../src/store/preset-store.js';
import {loadTemplates, packageRoot, templateIdPattern, templatesDir} from '../../src/store/templates.js';
import {cleanTempHomes, repoRoot, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

const dir = join(repoRoot, 'presets');
const files = readdirSync(dir).filter((f) => f.endsWith('.json'));

function plan(file: string): PlanDocument {
	const r = parsePlanDocument(JSON.parse(readFileSync(join(dir, file), 'utf8')));
	if (!r.ok) throw new Error(`${file}: ${r.errors.join('; ')}`);
	return r.value;
}

describe('template files', () => {
	it('has at least seven, covering the regions the issue asks for', () => {
		expect(files.length).toBeGreaterThanOrEqual(7);
		const regions = files.map((f) => plan(f).region);
		for (const region of ['upper-abdomen', 'kidney', 'pelvis', 'neck', 'obstetric', 'shoulder', 'breast'])
			expect(regions).toContain(region);
	});

	it.each(files)('%s validates strictly, with an id-shaped file name', (file) => {
		expect(file.replace(/\.json$/, '')).toMatch(templateIdPattern);
		const raw = JSON.parse(readFileSync(join(dir, file), 'utf8')) as Record<string, unknown>;
		expect(['evenecho-plan/1', 'evenecho-plan/2']).toContain(raw['format']);
		const r = parsePlanDocument(raw);
		expect(r.ok ? [] : r.errors).toEqual([]);
	});

	it.each(files)('%s uses library tissues only, names probe, bandwidth, depth and sliders explicitly', (file) => {
		const raw = JSON.parse(readFileSync(join(dir, file), 'utf8')) as {
			layers: Array<{tissue: unknown}>;
			probe: object;
			display: object;
			sliders: object;
		};
		for (const l of raw.layers) {
			expect(typeof l.tissue).toBe('string');
			expect(libraryTissue(l.tissue as string)).toBeDefined();
		}
		expect(raw.probe).toHaveProperty('centerMhz');
		expect(raw.probe).toHaveProperty('bandwidthFraction');
		expect(raw.display).toHaveProperty('depthCm');
		expect(raw.sliders).toHaveProperty('count');
	});

	it.each(files)('%s says where its values come from and when to adapt it', (file) => {
		const note = plan(file).note ?? '';
		expect(note).toMatch(/When to adapt it:/);
		expect(note).toMatch(/not a real patient/);
		// Every typical value is sourced or marked (house rule: "common practice, no source" / "from memory").
		expect(note).toMatch(/common practice, no source/);
		expect(note).toMatch(/from memory/);
	});

	it.each(files)('%s gives a finite curve and one slider value per slider', (file) => {
		const p = plan(file);
		const r = computeCurve(resolvePlan(p));
		expect(r.samples.length).toBeGreaterThan(10);
		for (const s of r.samples) expect(Number.isFinite(s.compensationDb)).toBe(true);
		expect(r.fit.sliders).toHaveLength(p.sliders.count);
		for (const s of r.fit.sliders) {
			expect(s.gainDb).toBeGreaterThanOrEqual(p.sliders.minDb - 1e-9);
			expect(s.gainDb).toBeLessThanOrEqual(p.sliders.maxDb + 1e-9);
		}
		// A starting point the sliders can follow (the engine warns above 2 dB).
		expect(r.warnings.map((w) => w.code)).not.toContain('slider-range-exceeded');
	});

	it.each(files)('%s starts with skin 1–4 mm thick (skin thickness: from memory)', (file) => {
		const first = plan(file).layers[0]!;
		expect(first.tissue).toBe('skin');
		expect(first.thicknessCm).toBeGreaterThanOrEqual(0.1);
		expect(first.thicknessCm).toBeLessThanOrEqual(0.4);
	});

	it('obstetric template: fat as the mean minimum over the pregnant abdomen, 1.4 cm (Carson, Rubin & Chiang 1989)', () => {
		const p = plan('obstetric-second-trimester.json');
		expect(p.layers.find((l) => l.tissue === 'fat')?.thicknessCm).toBe(1.4);
	});

	it('obstetric template: overlying attenuation not below the lowest measured, 0.8 dB/MHz (Carson, Rubin & Chiang 1989)', () => {
		// One-way attenuation per MHz of everything in front of the amniotic fluid, α0·d with n = 1 tissues.
		const p = plan('obstetric-second-trimester.json');
		const fluid = p.layers.findIndex((l) => l.tissue === 'amniotic-fluid');
		expect(fluid).toBeGreaterThan(0);
		const overlying = p.layers.slice(0, fluid).reduce((sum, l) => {
			const t = libraryTissue(l.tissue as string)!;
			expect(t.exponent).toBe(1);
			return sum + t.alphaDbPerCmMhz * l.thicknessCm;
		}, 0);
		expect(overlying).toBeGreaterThanOrEqual(0.8);
	});

	it('shoulder template: the curve is held flat from the humeral head on (bone barrier)', () => {
		const r = computeCurve(resolvePlan(plan('shoulder-tendon.json')));
		expect(r.blockedDepthCm).not.toBeNull();
		expect(r.warnings.map((w) => w.code)).toContain('strong-reflector');
	});
});

describe('templates through the store', () => {
	it('finds the package root from the sources (and, in the CLI tests, from dist)', () => {
		expect(packageRoot()).toBe(repoRoot);
		expect(templatesDir()).toBe(dir);
	});

	it('loads every file as a template, with no problems', () => {
		const {templates, problems} = loadTemplates();
		expect(problems).toEqual([]);
		expect(templates.map((t) => `${t.id}.json`).sort()).toEqual([...files].sort());
	});

	it('lists templates with isTemplate set and finds them by id and by name', () => {
		const store = openPresetStore({home: tempHome()});
		const {presets, problems} = store.list();
		expect(problems).toEqual([]);
		expect(presets.filter((p) => p.isTemplate)).toHaveLength(files.length);
		const kidney = store.find('kidney');
		expect(kidney?.isTemplate).toBe(true);
		expect(store.find(kidney!.name)?.id).toBe('kidney');
		expect(store.find(kidney!.name.toUpperCase())?.id).toBe('kidney');
	});

	it('never changes a template file: saving under its name makes a user copy with its own id', () => {
		const home = tempHome();
		const store = openPresetStore({home});
		const file = join(dir, 'upper-abdomen.json');
		const before = createHash('sha256').update(readFileSync(file)).digest('hex');
		const template = store.get('upper-abdomen');
		const copy = store.save(template.name, {...template.plan, display: {...template.plan.display, depthCm: 18}});
		expect(copy.isTemplate).toBe(false);
		expect(copy.id).toMatch(/^user:/);
		expect(copy.id).not.toBe(template.id);
		expect(createHash('sha256').update(readFileSync(file)).digest('hex')).toBe(before);
		// The id reaches the template; the name now reaches your copy.
		expect(store.get('upper-abdomen').plan.display.depthCm).toBe(16);
		expect(store.get(template.name).id).toBe(copy.id);
		expect(store.get(template.name).plan.display.depthCm).toBe(18);
		expect(
			store
				.list()
				.presets.filter((p) => p.name === template.name)
				.map((p) => p.isTemplate)
				.sort(),
		).toEqual([false, true]);
	});

	it('refuses to rename or delete a template', () => {
		const store = openPresetStore({home: tempHome()});
		expect(() => store.rename('kidney', 'Mine')).toThrow(/built-in template and cannot be renamed/);
		expect(() => store.remove('kidney')).toThrow(/built-in template and cannot be deleted/);
	});
});
