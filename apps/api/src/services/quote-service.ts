import type { DataSource, EntityManager } from 'typeorm';
import {
  canQuoteJob,
  canTransition,
  clientLines,
  depositPence,
  formatPence,
  jobStatusLabels,
  priceQuote,
  quoteStatusLabels,
  travelPerDayPence,
  type CostingSettings,
  type PublicQuoteDto,
  type QuoteAcceptedDto,
  type QuoteContent,
  type QuoteDto,
  type QuoteStatus,
  type QuoteSummaryDto,
  type QuoteVersionDto,
  shortDayLabel,
} from '@hodboard/shared';
import { Assignment, AuditEvent, Client, Deposit, Firm, Job, Notification, Quote, QuoteVersion, Site } from '../entities/index.js';
import { errors } from '../errors.js';
import type { Clock } from '../lib/clock.js';
import type { EventBus } from '../lib/event-bus.js';
import { hashToken, newOpaqueToken } from '../lib/tokens.js';
import { todayIn } from '../lib/today.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit, snapshot } from './audit-service.js';
import type { CostingSettingsService } from './costing-settings-service.js';
import { FirmScope } from './firm-scope.js';
import type { Mailer } from './mailer.js';
import type { PaymentService } from './payment-service.js';
import { ACCESS_CAUTION, renderQuotePdf } from './quote-pdf.js';
import { formatAddress } from './site-service.js';

export interface QuoteServiceOptions {
  appUrl: string;
}

interface Loaded {
  quote: Quote;
  job: Job;
  client: Client;
  site: Site;
  firm: Firm;
  current: QuoteVersion;
  versions: QuoteVersion[];
  deposit: Deposit | null;
}

export interface QuotePdf {
  filename: string;
  body: Buffer;
}

/** Highest total a quote may reach: it is stored in integer columns. */
const MAX_TOTAL_PENCE = 2_000_000_000;

export class QuoteService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly mailer: Mailer,
    private readonly clock: Clock,
    private readonly events: EventBus,
    private readonly costing: CostingSettingsService,
    private readonly payments: PaymentService,
    private readonly options: QuoteServiceOptions,
  ) {}

  async list(actor: Actor, query: { jobId?: string; status?: QuoteStatus }): Promise<QuoteSummaryDto[]> {
    requirePermission(actor, 'quotes:manage');
    await this.expireDue(this.dataSource.manager, actor.firmId);
    const builder = new FirmScope(this.dataSource.manager, actor.firmId)
      .query(Quote, 'quote')
      .innerJoinAndSelect('quote.job', 'job')
      .innerJoinAndMapOne('quote.client', Client, 'client', 'client.id = job.client_id')
      .innerJoinAndMapOne('quote.current', QuoteVersion, 'current', 'current.id = quote.current_version_id')
      .leftJoinAndMapOne('quote.deposit', Deposit, 'deposit', 'deposit.quote_id = quote.id')
      .orderBy('quote.created_at', 'DESC');
    if (query.jobId) builder.andWhere('quote.job_id = :jobId', { jobId: query.jobId });
    if (query.status) builder.andWhere('quote.status = :status', { status: query.status });
    const rows = (await builder.getMany()) as Array<Quote & { client: Client; current: QuoteVersion; deposit: Deposit | null }>;
    return rows.map((q) => ({
      id: q.id,
      reference: q.reference,
      jobId: q.jobId,
      jobReference: q.job.reference,
      jobTitle: q.job.title,
      clientName: q.client.name,
      status: q.status,
      versionNumber: q.current.number,
      grossPence: q.current.grossPence,
      validUntil: q.validUntil,
      depositStatus: q.deposit?.status ?? null,
      createdAt: q.createdAt.toISOString(),
    }));
  }

  async get(actor: Actor, id: string): Promise<QuoteDto> {
    requirePermission(actor, 'quotes:manage');
    return this.dataSource.transaction(async (manager) => {
      const quote = await new FirmScope(manager, actor.firmId).lockForUpdate(Quote, id, 'Quote');
      await this.expireIfDue(manager, quote);
      return toQuoteDto(await this.load(manager, quote));
    });
  }

  async create(actor: Actor, input: { jobId: string; content: QuoteContent }): Promise<QuoteDto> {
    requirePermission(actor, 'quotes:manage');
    const dto = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const job = await scope.lockForUpdate(Job, input.jobId, 'Job');
      if (await manager.existsBy(Quote, { jobId: job.id })) {
        throw errors.alreadyExists(`${job.reference} already has a quote; revise that one instead.`);
      }
      if (!canQuoteJob(job.status)) {
        throw errors.illegalTransition(`${job.reference} is ${job.status}; only open jobs can be quoted.`);
      }
      const quote = await manager.save(scope.create(Quote, { jobId: job.id, reference: job.reference.replace(/^J/, 'Q'), status: 'draft' }));
      const version = await this.saveVersion(manager, quote, 1, input.content);
      quote.currentVersionId = version.id;
      await manager.save(quote);
      await recordAudit(manager, actor, { entity: 'quote', entityId: quote.id, action: 'created', after: { reference: quote.reference, grossPence: version.grossPence } });
      return toQuoteDto(await this.load(manager, quote));
    });
    this.publish(actor.firmId, dto);
    return dto;
  }

  async update(actor: Actor, id: string, input: { content: QuoteContent; version: number }): Promise<QuoteDto> {
    requirePermission(actor, 'quotes:manage');
    const dto = await this.dataSource.transaction(async (manager) => {
      const quote = await this.lockCurrent(manager, actor, id, input.version);
      const current = await manager.findOneByOrFail(QuoteVersion, { id: quote.currentVersionId! });
      if (quote.status !== 'draft' || current.frozenAt) {
        throw errors.illegalTransition(`Version ${current.number} of ${quote.reference} has been sent and cannot change; revise it to make a new version.`);
      }
      const before = { grossPence: current.grossPence };
      const settings = await this.costing.settingsFor(manager, actor.firmId);
      Object.assign(current, this.priced(input.content, settings));
      await manager.save(current);
      quote.updatedAt = this.clock();
      await manager.save(quote);
      await recordAudit(manager, actor, { entity: 'quote', entityId: quote.id, action: 'updated', before, after: { version: current.number, grossPence: current.grossPence } });
      return toQuoteDto(await this.load(manager, quote));
    });
    this.publish(actor.firmId, dto);
    return dto;
  }

  /** Freezes the current version at today's settings, e-mails the client a link, and marks the job quoted. */
  async send(actor: Actor, id: string, input: { version: number; email?: string }): Promise<QuoteDto> {
    requirePermission(actor, 'quotes:manage');
    const dto = await this.dataSource.transaction(async (manager) => {
      const quote = await this.lockCurrent(manager, actor, id, input.version);
      if (quote.status !== 'draft') {
        throw errors.illegalTransition(`${quote.reference} is ${quoteStatusLabels[quote.status].toLowerCase()}; revise it to send a new version.`);
      }
      const loaded = await this.load(manager, quote);
      const to = input.email || loaded.client.email;
      if (!to) throw errors.validation([{ path: 'email', message: `${loaded.client.name} has no e-mail address; enter one to send to` }]);
      const settings = await this.costing.settingsFor(manager, actor.firmId);
      const now = this.clock();
      Object.assign(loaded.current, this.priced(loaded.current.content, settings), { frozenAt: now });
      await manager.save(loaded.current);
      const token = newOpaqueToken();
      Object.assign(quote, {
        status: 'sent',
        sentTo: to,
        validUntil: addDays(todayIn(loaded.firm.timeZone, now), settings.quoteValidityDays),
        tokenHash: hashToken(token),
        tokenUsedAt: null,
        declinedAt: null,
        declineReason: null,
      });
      await manager.save(quote);
      if (loaded.job.status === 'enquiry') {
        loaded.job.status = 'quoted';
        await manager.save(loaded.job);
        await recordAudit(manager, actor, { entity: 'job', entityId: loaded.job.id, action: 'status-changed', before: { status: 'enquiry' }, after: { status: 'quoted' } });
      }
      await recordAudit(manager, actor, { entity: 'quote', entityId: quote.id, action: 'sent', after: { to, version: loaded.current.number, grossPence: loaded.current.grossPence } });
      const reloaded = await this.load(manager, quote);
      // Inside the transaction: if the mail server refuses, the quote stays a draft rather than "sent" to nobody.
      await this.mailer.send(quoteMail(reloaded, to, `${this.options.appUrl}/q/${token}`));
      return toQuoteDto(reloaded);
    });
    this.publish(actor.firmId, dto);
    this.events.publish({ firmId: actor.firmId, type: 'job:updated', id: dto.jobId });
    return dto;
  }

  /** A new draft version from the current one; the sent versions stay as they were and the old link stops working. */
  async revise(actor: Actor, id: string, input: { version: number }): Promise<QuoteDto> {
    requirePermission(actor, 'quotes:manage');
    const dto = await this.dataSource.transaction(async (manager) => {
      const quote = await this.lockCurrent(manager, actor, id, input.version);
      await this.expireIfDue(manager, quote);
      if (quote.status === 'draft') throw errors.illegalTransition(`${quote.reference} is already a draft; edit it directly.`);
      if (quote.status === 'accepted') throw errors.illegalTransition(`${quote.reference} has been accepted and cannot be revised.`);
      const current = await manager.findOneByOrFail(QuoteVersion, { id: quote.currentVersionId! });
      const next = await this.saveVersion(manager, quote, current.number + 1, current.content);
      const before = { status: quote.status, version: current.number };
      Object.assign(quote, { status: 'draft', currentVersionId: next.id, tokenHash: null, tokenUsedAt: null, validUntil: null });
      await manager.save(quote);
      await recordAudit(manager, actor, { entity: 'quote', entityId: quote.id, action: 'revised', before, after: { status: 'draft', version: next.number } });
      return toQuoteDto(await this.load(manager, quote));
    });
    this.publish(actor.firmId, dto);
    return dto;
  }

  async pdf(actor: Actor, id: string, versionNumber?: number): Promise<QuotePdf> {
    requirePermission(actor, 'quotes:manage');
    const quote = await new FirmScope(this.dataSource.manager, actor.firmId).get(Quote, id, 'Quote');
    const loaded = await this.load(this.dataSource.manager, quote);
    const version = versionNumber === undefined ? loaded.current : loaded.versions.find((v) => v.number === versionNumber);
    if (!version) throw errors.notFound(`Version ${versionNumber} of ${quote.reference}`);
    return this.renderPdf(loaded, version);
  }

  async publicView(token: string): Promise<PublicQuoteDto> {
    return this.dataSource.transaction(async (manager) => {
      const quote = await this.byToken(manager, token);
      await this.expireIfDue(manager, quote);
      return toPublicDto(await this.load(manager, quote), this.payments.isEnabled);
    });
  }

  async publicPdf(token: string): Promise<QuotePdf> {
    const quote = await this.byToken(this.dataSource.manager, token);
    const loaded = await this.load(this.dataSource.manager, quote);
    return this.renderPdf(loaded, loaded.current);
  }

  /**
   * The client's yes. The link accepts once: the quote row is locked, so two clicks cannot both succeed.
   * Records who, when and from where, books the job (the board's tray picks it up) and opens the deposit.
   * A job already on the board stays where it is. A cancelled job's quote is refused, and the office is told
   * once per version that the client tried.
   */
  async accept(token: string, input: { name: string }, ip: string): Promise<QuoteAcceptedDto> {
    const outcome = await this.dataSource.transaction(async (manager) => {
      const quote = await this.byToken(manager, token, true);
      await this.expireIfDue(manager, quote);
      this.assertAnswerable(quote);
      const job = await manager.findOneOrFail(Job, { where: { id: quote.jobId, firmId: quote.firmId }, lock: { mode: 'pessimistic_write' } });
      const loaded = await this.load(manager, quote);
      if (job.status === 'cancelled') {
        await this.tellOfficeOfCancelledAcceptance(manager, loaded, input.name);
        return { refused: loaded } as const;
      }
      const now = this.clock();
      Object.assign(quote, { status: 'accepted', acceptedName: input.name, acceptedAt: now, acceptedIp: ip, tokenUsedAt: now });
      await manager.save(quote);
      const placed = await manager.findOne(Assignment, { where: { jobId: job.id, firmId: quote.firmId }, relations: { crew: true } });
      if (!placed && job.status !== 'booked' && canTransition(job.status, 'booked')) {
        const before = { status: job.status };
        job.status = 'booked';
        await manager.save(job);
        await clientAudit(manager, quote.firmId, { entity: 'job', entityId: job.id, action: 'status-changed', before, after: { status: 'booked', by: 'quote accepted' } });
      }
      await clientAudit(manager, quote.firmId, {
        entity: 'quote', entityId: quote.id, action: 'accepted',
        before: { status: 'sent' }, after: { name: input.name, ip, at: now.toISOString(), version: loaded.current.number, grossPence: loaded.current.grossPence },
      });
      let deposit: Deposit | null = null;
      if (loaded.current.depositPence > 0) {
        deposit = await manager.save(manager.create(Deposit, { firmId: quote.firmId, quoteId: quote.id, amountPence: loaded.current.depositPence, status: 'pending' }));
      }
      if (loaded.firm.email) {
        const where = placed
          ? `The job is already on the board with ${placed.crew.name} from ${shortDayLabel(placed.startDate)}; it stays where it is.`
          : job.status === 'booked'
            ? "The job is booked and waiting in the board's tray."
            : `The job is ${jobStatusLabels[job.status].toLowerCase()} and has been left as it is.`;
        await this.mailer.send({
          to: loaded.firm.email,
          subject: `Quote ${quote.reference} accepted by ${input.name}`,
          text: `${input.name} accepted quote ${quote.reference} (version ${loaded.current.number}, ${formatPence(loaded.current.grossPence)}) for ${loaded.job.title} at ${formatAddress(loaded.site)}.\n\n${where}`,
        });
      }
      return { quote, job, deposit, clientEmail: quote.sentTo };
    });
    if (outcome.refused) {
      const { firm } = outcome.refused;
      throw errors.illegalTransition(
        `This job has been cancelled, so the quote can no longer be accepted. Please contact ${firm.name}${firm.phone ? ` on ${firm.phone}` : firm.email ? ` at ${firm.email}` : ''}.`,
      );
    }
    const accepted = outcome;
    this.events.publish({ firmId: accepted.quote.firmId, type: 'quote:updated', id: accepted.quote.id, version: accepted.quote.version });
    this.events.publish({ firmId: accepted.quote.firmId, type: 'job:updated', id: accepted.job.id, version: accepted.job.version });
    let depositUrl: string | null = null;
    if (accepted.deposit && this.payments.isEnabled) {
      depositUrl = await this.payments.checkout({
        deposit: accepted.deposit,
        quoteReference: accepted.quote.reference,
        clientEmail: accepted.clientEmail,
        returnUrl: `${this.options.appUrl}/q/${token}`,
      });
    }
    return { status: 'accepted', depositUrl };
  }

  async decline(token: string, input: { reason: string | null }): Promise<PublicQuoteDto> {
    const dto = await this.dataSource.transaction(async (manager) => {
      const quote = await this.byToken(manager, token, true);
      await this.expireIfDue(manager, quote);
      this.assertAnswerable(quote);
      const now = this.clock();
      Object.assign(quote, { status: 'declined', declinedAt: now, declineReason: input.reason, tokenUsedAt: now });
      await manager.save(quote);
      await clientAudit(manager, quote.firmId, { entity: 'quote', entityId: quote.id, action: 'declined', before: { status: 'sent' }, after: { reason: input.reason } });
      return { firmId: quote.firmId, id: quote.id, version: quote.version, view: toPublicDto(await this.load(manager, quote), this.payments.isEnabled) };
    });
    this.events.publish({ firmId: dto.firmId, type: 'quote:updated', id: dto.id, version: dto.version });
    return dto.view;
  }

  /** A fresh payment page for an accepted quote's unpaid deposit (an earlier one may have lapsed). */
  async depositCheckout(token: string): Promise<{ url: string }> {
    const quote = await this.byToken(this.dataSource.manager, token);
    if (quote.status !== 'accepted') throw errors.illegalTransition('The deposit can be paid once the quote is accepted.');
    const deposit = await this.dataSource.manager.findOneBy(Deposit, { quoteId: quote.id });
    if (!deposit) throw errors.notFound('A deposit for this quote');
    if (deposit.status === 'paid') throw errors.conflict('The deposit has already been paid. Thank you.');
    const url = await this.payments.checkout({ deposit, quoteReference: quote.reference, clientEmail: quote.sentTo, returnUrl: `${this.options.appUrl}/q/${token}` });
    return { url };
  }

  /** One e-mail to the firm per quote version, however often the client tries the link. */
  private async tellOfficeOfCancelledAcceptance(manager: EntityManager, loaded: Loaded, name: string): Promise<void> {
    const { firm, quote, current, job } = loaded;
    if (!firm.email) return;
    const inserted = await manager.createQueryBuilder().insert().into(Notification)
      .values({ firmId: quote.firmId, dedupeKey: `quote-accept-refused:${quote.id}:v${current.number}`, channel: 'email', recipient: firm.email })
      .orIgnore().returning('id').execute();
    if ((inserted.raw as unknown[]).length === 0) return;
    await this.mailer.send({
      to: firm.email,
      subject: `${name} tried to accept quote ${quote.reference}, but ${job.reference} is cancelled`,
      text: `${name} tried to accept quote ${quote.reference} (version ${current.number}, ${formatPence(current.grossPence)}) for ${job.title} at ${formatAddress(loaded.site)}.\n\n` +
        `The job is cancelled, so the acceptance was refused and nothing was changed. The client was asked to contact you.`,
    });
  }

  private assertAnswerable(quote: Quote): void {
    if (quote.tokenUsedAt || quote.status === 'accepted' || quote.status === 'declined') {
      throw errors.illegalTransition(
        quote.status === 'accepted' ? 'This quote has already been accepted.' : `This quote has already been answered (${quoteStatusLabels[quote.status].toLowerCase()}).`,
      );
    }
    if (quote.status === 'expired') throw errors.illegalTransition('This quote has lapsed. Ask the firm for an updated one.');
    if (quote.status !== 'sent') throw errors.illegalTransition('This quote is being revised; the firm will send the new version.');
  }

  private async byToken(manager: EntityManager, token: string, lock = false): Promise<Quote> {
    const quote = await manager.findOne(Quote, {
      where: { tokenHash: hashToken(token) },
      ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}),
    });
    if (!quote) throw errors.tokenInvalid('This quote link is not valid. The firm may have sent a newer version; use the link in the latest e-mail.');
    return quote;
  }

  private async lockCurrent(manager: EntityManager, actor: Actor, id: string, version: number): Promise<Quote> {
    const quote = await new FirmScope(manager, actor.firmId).lockForUpdate(Quote, id, 'Quote');
    if (quote.version !== version) throw errors.staleVersion('This quote');
    return quote;
  }

  private priced(content: QuoteContent, settings: CostingSettings) {
    let breakdown;
    try {
      breakdown = priceQuote(content, settings);
    } catch (error) {
      if (error instanceof RangeError) throw errors.validation([{ path: 'content', message: error.message }], 'The quote cannot be priced.');
      throw error;
    }
    if (breakdown.totals.grossPence > MAX_TOTAL_PENCE) {
      throw errors.validation([{ path: 'content', message: `The total may not exceed ${formatPence(MAX_TOTAL_PENCE)}` }]);
    }
    return {
      content,
      settings,
      breakdown,
      netPence: breakdown.totals.netPence,
      grossPence: breakdown.totals.grossPence,
      depositPence: depositPence(breakdown.totals.grossPence, settings.depositPct),
      travelPerDayPence: travelPerDayPence(settings, content.distanceMiles),
    };
  }

  private async saveVersion(manager: EntityManager, quote: Quote, number: number, content: QuoteContent): Promise<QuoteVersion> {
    const settings = await this.costing.settingsFor(manager, quote.firmId);
    return manager.save(manager.create(QuoteVersion, { firmId: quote.firmId, quoteId: quote.id, number, frozenAt: null, ...this.priced(content, settings) }));
  }

  private async load(manager: EntityManager, quote: Quote): Promise<Loaded> {
    const job = await manager.findOneOrFail(Job, { where: { id: quote.jobId, firmId: quote.firmId }, relations: { client: true, site: true } });
    const versions = await manager.find(QuoteVersion, { where: { quoteId: quote.id, firmId: quote.firmId }, order: { number: 'ASC' } });
    const current = versions.find((v) => v.id === quote.currentVersionId) ?? versions[versions.length - 1];
    if (!current) throw errors.notFound('The quote version');
    return {
      quote,
      job,
      client: job.client,
      site: job.site,
      firm: await manager.findOneByOrFail(Firm, { id: quote.firmId }),
      current,
      versions,
      deposit: await manager.findOneBy(Deposit, { quoteId: quote.id, firmId: quote.firmId }),
    };
  }

  private async expireDue(manager: EntityManager, firmId: string): Promise<void> {
    const due = await new FirmScope(manager, firmId).query(Quote, 'quote').andWhere("quote.status = 'sent'").andWhere('quote.valid_until IS NOT NULL').getMany();
    for (const quote of due) await this.expireIfDue(manager, quote);
  }

  /** A sent quote lapses the day after its last valid day, in the firm's own time zone. */
  private async expireIfDue(manager: EntityManager, quote: Quote): Promise<void> {
    if (quote.status !== 'sent' || !quote.validUntil) return;
    const firm = await manager.findOneByOrFail(Firm, { id: quote.firmId });
    if (todayIn(firm.timeZone, this.clock()) <= quote.validUntil) return;
    quote.status = 'expired';
    await manager.save(quote);
    await clientAudit(manager, quote.firmId, { entity: 'quote', entityId: quote.id, action: 'expired', before: { status: 'sent' }, after: { status: 'expired', validUntil: quote.validUntil } });
  }

  private renderPdf(loaded: Loaded, version: QuoteVersion): Promise<QuotePdf> {
    const issued = version.frozenAt ?? version.createdAt;
    return renderQuotePdf({
      firm: loaded.firm,
      reference: loaded.quote.reference,
      versionNumber: version.number,
      issuedOn: todayIn(loaded.firm.timeZone, issued),
      validUntil: version.id === loaded.current.id ? loaded.quote.validUntil : null,
      clientName: loaded.client.name,
      siteAddress: formatAddress(loaded.site),
      jobTitle: loaded.job.title,
      content: version.content,
      breakdown: version.breakdown,
      vatRegistered: version.settings.vatRegistered,
      depositPence: version.depositPence,
      paymentTerms: version.settings.paymentTerms,
      isDraft: !version.frozenAt,
    }).then((body) => ({ filename: `${loaded.quote.reference}-v${version.number}.pdf`, body }));
  }

  private publish(firmId: string, dto: QuoteDto): void {
    this.events.publish({ firmId, type: 'quote:updated', id: dto.id, version: dto.version });
  }
}

/** Audit lines for what the client does through the link: there is no signed-in user to name. */
async function clientAudit(
  manager: EntityManager,
  firmId: string,
  change: { entity: string; entityId: string; action: string; before?: object | null; after?: object | null },
): Promise<void> {
  await manager.save(manager.create(AuditEvent, {
    firmId,
    actorUserId: null,
    entity: change.entity,
    entityId: change.entityId,
    action: change.action,
    before: snapshot(change.before ?? null),
    after: snapshot(change.after ?? null),
  }));
}

function addDays(isoDate: string, days: number): string {
  const [y, m, d] = isoDate.split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d! + days)).toISOString().slice(0, 10);
}

function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function quoteMail(loaded: Loaded, to: string, link: string) {
  const { firm, quote, current, job } = loaded;
  const price = formatPence(current.grossPence);
  const until = quote.validUntil ?? '';
  return {
    to,
    subject: `Your quote ${quote.reference} from ${firm.name}`,
    text:
      `Hello ${loaded.client.contactName ?? loaded.client.name},\n\n` +
      `Here is our quote for ${job.title} at ${formatAddress(loaded.site)}: ${price}${current.settings.vatRegistered ? ' including VAT' : ''}.\n\n` +
      `Read it, download it as a PDF, and accept or decline it here (no account needed):\n\n${link}\n\n` +
      `The quote is valid until ${until}.\n\n${firm.name}${firm.phone ? `\n${firm.phone}` : ''}`,
    html:
      `<p>Hello ${escapeHtml(loaded.client.contactName ?? loaded.client.name)},</p>` +
      `<p>Here is our quote for ${escapeHtml(job.title)} at ${escapeHtml(formatAddress(loaded.site))}: <strong>${price}</strong>.</p>` +
      `<p><a href="${link}">Read the quote and accept or decline it</a> (no account needed). It is valid until ${escapeHtml(until)}.</p>` +
      `<p>${escapeHtml(firm.name)}</p>`,
  };
}

function toVersionDto(v: QuoteVersion, settings: CostingSettings | null): QuoteVersionDto {
  return {
    id: v.id,
    number: v.number,
    content: v.content,
    breakdown: v.breakdown,
    travelPerDayPence: v.travelPerDayPence,
    depositPence: v.depositPence,
    validityDays: (settings ?? v.settings).quoteValidityDays,
    paymentTerms: (settings ?? v.settings).paymentTerms,
    isFrozen: v.frozenAt !== null,
    sentAt: v.frozenAt?.toISOString() ?? null,
    createdAt: v.createdAt.toISOString(),
  };
}

function toQuoteDto(loaded: Loaded): QuoteDto {
  const { quote, job, client, site, current, versions, deposit } = loaded;
  return {
    id: quote.id,
    reference: quote.reference,
    jobId: job.id,
    jobReference: job.reference,
    jobTitle: job.title,
    jobStatus: job.status,
    clientName: client.name,
    clientEmail: client.email,
    siteAddress: formatAddress(site),
    status: quote.status,
    current: toVersionDto(current, null),
    versions: versions.map((v) => ({ id: v.id, number: v.number, grossPence: v.grossPence, isFrozen: v.frozenAt !== null, sentAt: v.frozenAt?.toISOString() ?? null })),
    sentTo: quote.sentTo,
    validUntil: quote.validUntil,
    acceptance: quote.acceptedAt && quote.acceptedName
      ? { name: quote.acceptedName, at: quote.acceptedAt.toISOString(), ip: quote.acceptedIp ?? '' }
      : null,
    declinedAt: quote.declinedAt?.toISOString() ?? null,
    declineReason: quote.declineReason,
    deposit: deposit ? { amountPence: deposit.amountPence, status: deposit.status, paidAt: deposit.paidAt?.toISOString() ?? null } : null,
    version: quote.version,
    createdAt: quote.createdAt.toISOString(),
  };
}

function toPublicDto(loaded: Loaded, canPayByCard: boolean): PublicQuoteDto {
  const { quote, current, firm, deposit } = loaded;
  const vat = current.breakdown.lines.find((l) => l.kind === 'vat');
  return {
    reference: quote.reference,
    versionNumber: current.number,
    status: quote.status,
    firm: { name: firm.name, email: firm.email, phone: firm.phone, address: firm.address },
    clientName: loaded.client.name,
    siteAddress: formatAddress(loaded.site),
    jobTitle: loaded.job.title,
    scope: current.content.scope,
    exclusions: current.content.exclusions,
    lines: clientLines(current.breakdown, current.content.breakdownLevel),
    netPence: current.breakdown.totals.netPence,
    vatPence: current.breakdown.totals.vatPence,
    grossPence: current.breakdown.totals.grossPence,
    vatRegistered: current.settings.vatRegistered,
    vatRatePct: vat ? current.settings.vatRatePct : 0,
    validUntil: quote.validUntil,
    paymentTerms: current.settings.paymentTerms,
    depositPence: current.depositPence,
    accessCaution: current.content.accessHire.length > 0 ? ACCESS_CAUTION : null,
    acceptance: quote.acceptedAt && quote.acceptedName ? { name: quote.acceptedName, at: quote.acceptedAt.toISOString() } : null,
    deposit: deposit
      ? { amountPence: deposit.amountPence, status: deposit.status, paidAt: deposit.paidAt?.toISOString() ?? null, canPay: canPayByCard && deposit.status === 'pending' }
      : null,
  };
}
