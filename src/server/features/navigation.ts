/** Go to definition and find references for names across the blocks of one note. */
import type { Location, Position } from 'vscode-languageserver';
import { nameAt, type NameSite, type NoteAnalysis, occurrencesOf } from '../analysis';

function location(uri: string, s: NameSite): Location {
  return { uri, range: { start: { line: s.line, character: s.start }, end: { line: s.line, character: s.end } } };
}

export function definition(a: NoteAnalysis, pos: Position): Location | null {
  const hit = nameAt(a, pos.line, pos.character);
  if (!hit?.definition) return null;
  return location(a.uri, hit.definition);
}

export function references(a: NoteAnalysis, pos: Position, includeDeclaration: boolean): Location[] {
  const hit = nameAt(a, pos.line, pos.character);
  if (!hit?.definition) return [];
  return occurrencesOf(a, hit.definition)
    .filter((s) => includeDeclaration || s !== hit.definition)
    .map((s) => location(a.uri, s));
}

/** Highlights of the same name in the note (read/write distinction: the definition is the write). */
export function highlights(a: NoteAnalysis, pos: Position): { range: Location['range']; kind: 2 | 3 }[] {
  const hit = nameAt(a, pos.line, pos.character);
  if (!hit?.definition) return [];
  return occurrencesOf(a, hit.definition).map((s) => ({ range: location(a.uri, s).range, kind: s === hit.definition ? 3 : 2 }));
}
