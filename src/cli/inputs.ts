/**
 * Shared input loading for every command that takes --samples and --boundary:
 * reads the files, then calls the library's readers, validation and projection.
 *
 * CONTRACT (used by surface, variability, build ...): keep this signature stable.
 */
import type { FieldInputs } from '../types.js';
import { UserError } from '../errors.js';

export interface InputOptions {
  /** samples file: .geojson/.json, .csv (lab style), .shp (with .dbf/.prj/.cpg beside), or .zip */
  samples: string;
  /** boundary file: .geojson/.json, .shp or .zip */
  boundary: string;
  /** zone polygons for zone-composite samples (optional; may also come inside the samples file) */
  zones?: string;
  /** CSV column map "id=Sample ID,lat=Latitude,..." (optional; headers are detected otherwise) */
  columns?: string;
  /** factor from 0-6 in nitrate/sulphate lb/ac to 0-24 in, when only 0-6 in was sampled; no default */
  depthFactor?: number;
  /** drop samples outside the boundary instead of only warning */
  dropOutside?: boolean;
}

/** Reads, validates and projects the inputs. Throws UserError for anything the user must fix. */
export function loadInputs(opts: InputOptions): FieldInputs {
  void opts;
  throw new UserError('loadInputs is not implemented yet (foundation issue)');
}
