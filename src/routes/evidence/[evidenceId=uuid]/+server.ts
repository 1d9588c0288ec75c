import { evidenceFile } from '../_file';

/** The file of one piece of evidence, as uploaded (its members only). */
export const GET = (event) => evidenceFile(event, 'original');
