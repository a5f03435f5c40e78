/**
 * Golden render tests: each `tests/golden/<case>/recipe.json` (bare recipe parameters)
 * is rendered with the starter templates in `templates/` and compared byte for byte
 * with `expected.py`. `UPDATE_GOLDEN=1` rewrites the expected files; review the diff.
 * Every output is also parsed by python3: the whole program must compile, and the
 * parameters block must hold nothing but `NAME = <literal>` assignments.
 */
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readTemplateDirectory } from '../../scripts/cli-render';
import { recipeParamsSchema, type RecipeParams } from '../../src/lib/calibration/recipe';
import { runPythonJson } from '../../src/lib/script/python-test-harness';
import { renderProgram } from '../../src/lib/script/render';
import { buildRenderContext } from '../../src/lib/script/render-context';

const ROOT = join(import.meta.dirname, '..', '..');
const TEMPLATES = join(ROOT, 'templates');
const GOLDEN = import.meta.dirname;
const UPDATE = process.env.UPDATE_GOLDEN === '1';
// The markers the starter template puts around its parameters block.
const PARAMS_START = '# --- parameters ---';
const PARAMS_END = '# --- end of parameters ---';

function listCases(): string[] {
	return readdirSync(GOLDEN)
		.filter((name) => existsSync(join(GOLDEN, name, 'recipe.json')))
		.sort();
}

function readRecipe(name: string): RecipeParams {
	const parsed = recipeParamsSchema.safeParse(JSON.parse(readFileSync(join(GOLDEN, name, 'recipe.json'), 'utf8')));
	if (!parsed.success) throw new Error(`tests/golden/${name}/recipe.json is not valid recipe parameters: ${parsed.error.message}`);
	return parsed.data;
}

function renderCase(name: string, files: Record<string, string>): string {
	const recipe = readRecipe(name);
	const context = buildRenderContext({
		recipe, observation: null, recipeId: `golden-${name}`, recipeVersion: 1, templateName: 'standard', templateVersion: 1
	});
	return renderProgram(files, context);
}

const PYTHON_CHECK = String.raw`
import ast, io, json, sys, tokenize
programs = json.load(open(sys.argv[1], encoding="utf-8"))
START, END = programs.pop("__markers__")

def shape(tree):
    # The program's structure with every constant blanked: user text can change constants only.
    class Blank(ast.NodeTransformer):
        def visit_Constant(self, node):
            return ast.copy_location(ast.Constant(value=None), node)
    return ast.dump(Blank().visit(tree))

out = {}
for name, program in programs.items():
    raw = program.encode("utf-8")
    result = {"problems": []}
    try:
        tree = ast.parse(raw)
        compile(tree, name, "exec")
    except SyntaxError as e:
        result["problems"].append("program does not parse: %s (line %s)" % (e.msg, e.lineno))
        out[name] = result
        continue
    result["shape"] = shape(tree)
    if tokenize.detect_encoding(io.BytesIO(raw).readline)[0] != "utf-8":
        result["problems"].append("the file declares an encoding other than utf-8")
    if len(program.splitlines()) != len(program.split("\n")) - (1 if program.endswith("\n") else 0):
        result["problems"].append("the program contains line breaks other than \\n")
    lines = program.split("\n")
    starts = [i for i, l in enumerate(lines) if l == START]
    ends = [i for i, l in enumerate(lines) if l == END]
    if len(starts) != 1 or len(ends) != 1 or starts[0] > ends[0]:
        result["problems"].append("expected one %r line before one %r line" % (START, END))
        out[name] = result
        continue
    block = ast.parse("\n".join(lines[starts[0] + 1:ends[0]]))
    values = {}
    for stmt in block.body:
        if not (isinstance(stmt, ast.Assign) and len(stmt.targets) == 1 and isinstance(stmt.targets[0], ast.Name)):
            result["problems"].append("line %d of the parameters block is not NAME = literal: %s" % (stmt.lineno, ast.dump(stmt)[:120]))
            continue
        try:
            values[stmt.targets[0].id] = ast.literal_eval(stmt.value)
        except ValueError:
            result["problems"].append("%s is not a plain literal" % stmt.targets[0].id)
    result["names"] = list(values)
    result["values"] = {k: values[k] for k in ("TITLE", "NOTES", "FIELD_ROLES", "REFERENCE_ANTENNA", "REFERENCE_FALLBACKS", "STEPS") if k in values}
    out[name] = result
print(json.dumps(out))
`;

type PythonReport = {
	problems: string[];
	shape?: string;
	names?: string[];
	values?: Record<string, unknown>;
};

describe('golden renders of the starter templates', () => {
	const haveTemplates = existsSync(join(TEMPLATES, 'python', 'calibrate.py.hbs'));
	const cases = listCases();

	it('has the starter template set and at least four cases', () => {
		expect(haveTemplates, `templates/python/calibrate.py.hbs is missing: the starter templates have not been written yet`).toBe(true);
		expect(cases).toEqual(expect.arrayContaining(['full-lband', 'gain-only', 'hostile-text', 'southern-no-delay']));
	});

	const files = haveTemplates ? readTemplateDirectory(TEMPLATES) : {};
	const rendered = new Map<string, string>();
	const renderOnce = (name: string): string => {
		const known = rendered.get(name);
		if (known !== undefined) return known;
		const program = renderCase(name, files);
		rendered.set(name, program);
		return program;
	};

	for (const name of cases) {
		it(`renders ${name} exactly as tests/golden/${name}/expected.py`, () => {
			const program = renderOnce(name);
			expect(renderCase(name, files)).toBe(program); // deterministic: same inputs, same bytes
			const expectedPath = join(GOLDEN, name, 'expected.py');
			if (UPDATE) writeFileSync(expectedPath, program, 'utf8');
			expect(existsSync(expectedPath), `no ${expectedPath}: run UPDATE_GOLDEN=1 npx vitest run tests/golden and review it`).toBe(true);
			expect(program).toBe(readFileSync(expectedPath, 'utf8'));
		});
	}

	it('gives programs that python3 parses, with a parameters block of literal assignments only', () => {
		const programs: Record<string, unknown> = { __markers__: [PARAMS_START, PARAMS_END] };
		for (const name of cases) programs[name] = renderOnce(name);
		const reports = runPythonJson(PYTHON_CHECK, programs) as Record<string, PythonReport>;
		for (const name of cases) {
			expect(reports[name]?.problems, name).toEqual([]);
			expect(reports[name]?.names, name).toEqual(expect.arrayContaining(['TITLE', 'FIELD_ROLES', 'REFERENCE_ANTENNA', 'STEPS']));
		}
	});

	it('keeps hostile titles, notes and names as data: same program structure, exact values', () => {
		const hostile = readRecipe('hostile-text');
		const programs = { __markers__: [PARAMS_START, PARAMS_END], plain: renderOnce('full-lband'), hostile: renderOnce('hostile-text') };
		const reports = runPythonJson(PYTHON_CHECK, programs) as Record<string, PythonReport>;
		expect(reports.hostile?.problems).toEqual([]);
		// Same steps and shape as full-lband; only constants may differ, so no text became code.
		expect(reports.hostile?.shape).toBe(reports.plain?.shape);
		expect(reports.hostile?.values).toEqual({
			TITLE: hostile.title,
			NOTES: hostile.notes,
			FIELD_ROLES: Object.fromEntries(hostile.fields.map((f) => [f.name, f.roles])),
			REFERENCE_ANTENNA: hostile.reference_antenna.primary,
			REFERENCE_FALLBACKS: hostile.reference_antenna.fallbacks,
			STEPS: hostile.steps.map((s) => s.kind)
		});
	});
});
