/**
 * The manifest asks for ExcelApi 1.7 (manifest.xml, Requirements). This test reads the adapter's source with the
 * TypeScript compiler and the platform's own type declarations (@types/office-js marks each member with the
 * requirement set that brought it, "[Api set: ExcelApi 1.8]", and each parameter added later on its @param line), and
 * checks that every Excel API member src/excel uses, with the arguments it passes, is in ExcelApi 1.7 or older, or
 * sits inside `if (supportsExcelApi('x.y'))` with x.y at least its set.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import ts from 'typescript';

const EXCEL_DIR = resolve(process.cwd(), 'src/excel');

interface Use {
  readonly member: string;
  /** Minor version of the ExcelApi set that brought the member (1.x → x). */
  readonly set: number;
  /** Minor version named by the nearest enclosing supportsExcelApi guard, or null when unguarded. */
  readonly guard: number | null;
  readonly where: string;
}

const minor = (version: string): number => Number(version.split('.')[1]);

/** The version an enclosing `if (supportsExcelApi('1.x'))` grants `node` (inside its then-branch), else null. */
function guardOf(node: ts.Node): number | null {
  for (let at: ts.Node = node; at.parent !== undefined; at = at.parent) {
    const parent = at.parent;
    if (ts.isIfStatement(parent) && parent.thenStatement === at) {
      const m = /^supportsExcelApi\('(1\.\d+)'\)$/.exec(parent.expression.getText());
      if (m?.[1] !== undefined) return minor(m[1]);
    }
  }
  return null;
}

/** Every property access in src/excel whose declaration in the Office types names an ExcelApi set. */
function excelApiUses(): Use[] {
  const files = readdirSync(EXCEL_DIR)
    .filter((f) => /\.tsx?$/.test(f))
    .map((f) => join(EXCEL_DIR, f));
  const config = ts.getParsedCommandLineOfConfigFile(resolve(process.cwd(), 'tsconfig.json'), {}, {
    ...ts.sys,
    onUnRecoverableConfigFileDiagnostic: (d) => {
      throw new Error(ts.flattenDiagnosticMessageText(d.messageText, '\n'));
    },
  });
  if (config === undefined) throw new Error('tsconfig.json could not be read');
  const program = ts.createProgram(files, { ...config.options, noEmit: true });
  const checker = program.getTypeChecker();
  const uses: Use[] = [];
  for (const source of program.getSourceFiles()) {
    if (!source.fileName.startsWith(EXCEL_DIR)) continue;
    const visit = (node: ts.Node): void => {
      if (ts.isPropertyAccessExpression(node)) {
        // For a call, the overload actually chosen (getUsedRange(valuesOnly) came later than getUsedRange()).
        const call = ts.isCallExpression(node.parent) && node.parent.expression === node ? node.parent : undefined;
        const declaration =
          (call !== undefined ? checker.getResolvedSignature(call)?.declaration : undefined) ??
          checker.getSymbolAtLocation(node.name)?.declarations?.[0];
        const file = declaration?.getSourceFile();
        if (declaration !== undefined && file !== undefined && file.fileName.includes('@types/office-js')) {
          const doc = file.text.slice(declaration.getFullStart(), declaration.getStart());
          // The member's own set is on a line of its own; a parameter added later says so on its @param line,
          // and counts when the call passes that argument.
          const own = doc
            .split('\n')
            .filter((l) => !l.includes('@param'))
            .flatMap((l) => [...l.matchAll(/\[Api set: ExcelApi (1\.\d+)/g)].map((m) => minor(m[1] ?? '1.0')));
          const params = ts.isFunctionLike(declaration) ? declaration.parameters.map((p) => p.name.getText()) : [];
          const passed = [...doc.matchAll(/@param (\w+)[^\n]*\[Api set: ExcelApi (1\.\d+)/g)]
            .filter((m) => (call?.arguments.length ?? 0) > params.indexOf(m[1] ?? '') && params.includes(m[1] ?? ''))
            .map((m) => minor(m[2] ?? '1.0'));
          const sets = own.length > 0 ? [Math.min(...own), ...passed] : passed;
          if (sets.length > 0) {
            const line = source.getLineAndCharacterOfPosition(node.getStart()).line + 1;
            uses.push({
              member: node.name.text,
              set: Math.max(...sets),
              guard: guardOf(node),
              where: `${source.fileName.slice(EXCEL_DIR.length + 1)}:${line}`,
            });
          }
        }
      }
      ts.forEachChild(node, visit);
    };
    visit(source);
  }
  return uses;
}

describe('Excel API level of the adapter', () => {
  const uses = excelApiUses();

  it('finds the adapter\'s Excel API members in the platform types (the scan itself works)', () => {
    // Members the adapter is known to use, with their sets from the Office types: getRangeByIndexes and
    // freezePanes came with ExcelApi 1.7, the workbook settings with 1.4, getSelectedRange with 1.1.
    const setOf = (m: string): number | undefined => uses.find((u) => u.member === m)?.set;
    expect(setOf('getRangeByIndexes')).toBe(7);
    expect(setOf('freezePanes')).toBe(7);
    expect(setOf('settings')).toBe(4);
    expect(setOf('getSelectedRange')).toBe(1);
    // getUsedRange(true), values only, is the ExcelApi 1.2 overload (the plain one is 1.1): overloads are told apart.
    expect(setOf('getUsedRange')).toBe(2);
    // Paragraph wrapping: merge and rowHeight came with ExcelApi 1.2, wrapText and verticalAlignment with 1.1.
    expect([setOf('merge'), setOf('rowHeight'), setOf('wrapText'), setOf('verticalAlignment')]).toEqual([2, 2, 1, 1]);
    expect(uses.length).toBeGreaterThan(40);
  });

  it('uses nothing newer than ExcelApi 1.7 outside a supportsExcelApi guard of at least that version', () => {
    const offending = uses
      .filter((u) => u.set > 7 && (u.guard === null || u.guard < u.set))
      .map((u) => `${u.where} ${u.member} needs ExcelApi 1.${u.set}`);
    expect(offending).toEqual([]);
  });

  it('the newer members it does use are the starter sheet\'s cell checks (data validation, ExcelApi 1.8), guarded', () => {
    const newer = [...new Set(uses.filter((u) => u.set > 7).map((u) => `${u.member} 1.${u.set} guard 1.${u.guard}`))];
    expect(newer.sort()).toEqual(['dataValidation 1.8 guard 1.8', 'errorAlert 1.8 guard 1.8', 'rule 1.8 guard 1.8']);
  });
});
