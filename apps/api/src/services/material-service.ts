import Papa from 'papaparse';
import type { DataSource } from 'typeorm';
import {
  formatPence,
  materialInputSchema,
  parsePounds,
  type MaterialDto,
  type MaterialImportResultDto,
  type MaterialValues,
  type ProblemFieldError,
} from '@hodboard/shared';
import { Material } from '../entities/index.js';
import { errors } from '../errors.js';
import type { EventBus } from '../lib/event-bus.js';
import { toFieldErrors } from '../middleware/validate.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { assertVersion, FirmScope } from './firm-scope.js';

/** Column names of the price-list CSV, in the order an export writes them. */
export const MATERIAL_CSV_COLUMNS = ['name', 'unit', 'unit_price', 'vatable', 'supplier', 'last_updated'] as const;
const MAX_IMPORT_ROWS = 2000;

export class MaterialService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
  ) {}

  async list(actor: Actor, q?: string): Promise<MaterialDto[]> {
    requirePermission(actor, 'quotes:manage');
    const builder = new FirmScope(this.dataSource.manager, actor.firmId).query(Material, 'm').orderBy('m.name', 'ASC');
    if (q) builder.andWhere('(m.name ILIKE :q OR m.supplier ILIKE :q)', { q: `%${q.replace(/[%_\\]/g, '\\$&')}%` });
    return (await builder.getMany()).map(toMaterialDto);
  }

  async create(actor: Actor, input: MaterialValues): Promise<MaterialDto> {
    requirePermission(actor, 'quotes:manage');
    const saved = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const created = await manager.save(scope.create(Material, { ...input, nameKey: nameKey(input.name) }));
      await recordAudit(manager, actor, { entity: 'material', entityId: created.id, action: 'created', after: created });
      return created;
    });
    this.events.publish({ firmId: actor.firmId, type: 'material:created', id: saved.id, version: saved.version });
    return toMaterialDto(saved);
  }

  async update(actor: Actor, id: string, input: MaterialValues & { version?: number }): Promise<MaterialDto> {
    requirePermission(actor, 'quotes:manage');
    const { version, ...values } = input;
    const saved = await this.dataSource.transaction(async (manager) => {
      const existing = await new FirmScope(manager, actor.firmId).lockForUpdate(Material, id, 'Material');
      assertVersion(existing, version, 'This material');
      const before = { ...existing };
      const updated = await manager.save(Object.assign(existing, values, { nameKey: nameKey(values.name) }));
      await recordAudit(manager, actor, { entity: 'material', entityId: id, action: 'updated', before, after: updated });
      return updated;
    });
    this.events.publish({ firmId: actor.firmId, type: 'material:updated', id, version: saved.version });
    return toMaterialDto(saved);
  }

  async remove(actor: Actor, id: string): Promise<void> {
    requirePermission(actor, 'quotes:manage');
    await this.dataSource.transaction(async (manager) => {
      const existing = await new FirmScope(manager, actor.firmId).lockForUpdate(Material, id, 'Material');
      await manager.remove(existing);
      await recordAudit(manager, actor, { entity: 'material', entityId: id, action: 'deleted', before: { ...existing, id } });
    });
    this.events.publish({ firmId: actor.firmId, type: 'material:deleted', id });
  }

  /**
   * Reads a price list in the export's columns; a row whose name is already listed updates that price, and
   * columns the file leaves out keep their values. Every row is checked first and any error refuses the
   * whole file, so a half-read list never lands.
   */
  async importCsv(actor: Actor, csv: string): Promise<MaterialImportResultDto> {
    requirePermission(actor, 'quotes:manage');
    const { rows, columns } = parseMaterialCsv(csv);
    const result = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = new Map((await scope.find(Material)).map((m) => [m.nameKey, m]));
      let created = 0;
      let updated = 0;
      for (const row of rows) {
        const key = nameKey(row.name);
        const match = existing.get(key);
        if (match) {
          const before = { ...match };
          const changes: Partial<MaterialValues> = { name: row.name, unit: row.unit, unitPricePence: row.unitPricePence };
          if (columns.has('vatable')) changes.isVatable = row.isVatable;
          if (columns.has('supplier')) changes.supplier = row.supplier;
          await manager.save(Object.assign(match, changes, { nameKey: key }));
          await recordAudit(manager, actor, { entity: 'material', entityId: match.id, action: 'imported', before, after: match });
          updated += 1;
        } else {
          const saved = await manager.save(scope.create(Material, { ...row, nameKey: key }));
          existing.set(key, saved);
          await recordAudit(manager, actor, { entity: 'material', entityId: saved.id, action: 'imported', after: saved });
          created += 1;
        }
      }
      return { created, updated };
    });
    this.events.publish({ firmId: actor.firmId, type: 'material:imported', id: actor.firmId });
    return result;
  }

  async exportCsv(actor: Actor): Promise<string> {
    const materials = await this.list(actor);
    return Papa.unparse({
      fields: [...MATERIAL_CSV_COLUMNS],
      data: materials.map((m) => [
        m.name,
        m.unit,
        formatPence(m.unitPricePence).replace('£', '').replaceAll(',', ''),
        m.isVatable ? 'yes' : 'no',
        m.supplier ?? '',
        m.updatedAt.slice(0, 10),
      ]),
    }, { escapeFormulae: FORMULA_START });
  }
}

/**
 * A cell a spreadsheet would run as a formula (=, +, - or @ first, or a tab or carriage return that can hide one):
 * the export writes it with a leading ' so it opens as text, and the import takes that ' off again.
 */
const FORMULA_START = /^[=+\-@\t\r]/;
const DEFUSED = /^'[=+\-@\t\r]/;

const YES = new Set(['yes', 'y', 'true', '1']);
const NO = new Set(['no', 'n', 'false', '0']);

/** Parses and checks every row; throws one validation problem naming each bad cell as rows.N.column. */
export function parseMaterialCsv(csv: string): { rows: MaterialValues[]; columns: Set<string> } {
  const parsed = Papa.parse<Record<string, string>>(csv.replace(/^\uFEFF/, ''), {
    header: true,
    skipEmptyLines: 'greedy',
    transformHeader: (h) => h.trim().toLowerCase().replace(/\s+/g, '_'),
    transform: (value) => (DEFUSED.test(value) ? value.slice(1) : value),
  });
  const problems: ProblemFieldError[] = [];
  const headers = parsed.meta.fields ?? [];
  for (const required of ['name', 'unit', 'unit_price']) {
    if (!headers.includes(required)) problems.push({ path: `columns.${required}`, message: `The file needs a "${required}" column` });
  }
  if (problems.length) throw errors.validation(problems, 'The price list could not be read.');
  if (parsed.data.length === 0) throw errors.validation([{ path: 'rows', message: 'The file has no rows' }]);
  if (parsed.data.length > MAX_IMPORT_ROWS) throw errors.validation([{ path: 'rows', message: `At most ${MAX_IMPORT_ROWS} rows at a time` }]);
  for (const error of parsed.errors) {
    problems.push({ path: `rows.${(error.row ?? 0) + 1}`, message: error.message });
  }
  const seen = new Map<string, number>();
  const values: MaterialValues[] = [];
  parsed.data.forEach((raw, index) => {
    const rowNumber = index + 1;
    const price = parsePounds(raw.unit_price ?? '');
    const vatableText = (raw.vatable ?? 'yes').trim().toLowerCase() || 'yes';
    if (price === null) problems.push({ path: `rows.${rowNumber}.unit_price`, message: 'Use pounds and pence, like 0.62 or 1,240.00' });
    if (!YES.has(vatableText) && !NO.has(vatableText)) problems.push({ path: `rows.${rowNumber}.vatable`, message: 'Use yes or no' });
    const checked = materialInputSchema.safeParse({
      name: raw.name ?? '',
      unit: raw.unit ?? '',
      unitPricePence: price ?? 0,
      isVatable: YES.has(vatableText),
      supplier: raw.supplier ?? null,
    });
    if (!checked.success) {
      problems.push(...toFieldErrors(checked.error.issues, `rows.${rowNumber}`).map((p) => ({ ...p, path: p.path.replace('unitPricePence', 'unit_price') })));
      return;
    }
    const key = nameKey(checked.data.name);
    const earlier = seen.get(key);
    if (earlier !== undefined) problems.push({ path: `rows.${rowNumber}.name`, message: `Same material as row ${earlier}` });
    seen.set(key, rowNumber);
    values.push(checked.data);
  });
  if (problems.length) throw errors.validation(problems.slice(0, 50), 'Some rows of the price list need fixing; nothing was imported.');
  return { rows: values, columns: new Set(headers) };
}

function nameKey(name: string): string {
  return name.trim().toLowerCase().replace(/\s+/g, ' ');
}

export function toMaterialDto(m: Material): MaterialDto {
  return {
    id: m.id,
    name: m.name,
    unit: m.unit,
    unitPricePence: m.unitPricePence,
    isVatable: m.isVatable,
    supplier: m.supplier,
    updatedAt: m.updatedAt.toISOString(),
    version: m.version,
  };
}
