/** Reading a chain document from a JSON file a person picked, before it is sent as a new chain. */
import { parseChainDocument } from '@/dsp/chain/parse';

export type ImportReading = { ok: true; name: string; document: unknown } | { ok: false; message: string };

/** The document and a name for it (its own, else the file name), or what is wrong with the file. */
export function readChainFile(text: string, fileName: string): ImportReading {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    return { ok: false, message: `${fileName} is not JSON: ${error instanceof Error ? error.message : String(error)}` };
  }
  const result = parseChainDocument(json);
  if (!result.ok) {
    const more = result.issues.length > 1 ? ` (and ${result.issues.length - 1} more)` : '';
    return { ok: false, message: `${fileName} is not a valid chain document: ${result.issues[0].message}${more}` };
  }
  const name = result.document.name.trim() || fileName.replace(/\.(chain\.)?json$/i, '') || 'Imported chain';
  return { ok: true, name, document: json };
}
