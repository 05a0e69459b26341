// One way to report a bad field: the message names the field path, the location names the file,
// line and column.
import { InputError } from '../../core/errors.js';
import { fieldPath, type FieldPath, type StructuredFile } from './read-structured.js';

export type Site = Pick<StructuredFile, 'file' | 'locate'>;

export function fail(site: Site, path: FieldPath, message: string): never {
  throw new InputError(`${fieldPath(path)}: ${message}`, site.locate(path));
}
