import Stripe from 'stripe';
import type { DataSource } from 'typeorm';
import { AuditEvent, Deposit, Quote } from '../entities/index.js';
import { errors } from '../errors.js';
import type { Clock } from '../lib/clock.js';
import type { EventBus } from '../lib/event-bus.js';
import { snapshot } from './audit-service.js';

export interface StripeOptions {
  secretKey: string;
  webhookSecret: string;
  /** A local Stripe-compatible fake in development and tests; unset for the real service. */
  host?: string;
  port?: number;
}

export interface CheckoutRequest {
  deposit: Deposit;
  quoteReference: string;
  clientEmail: string | null;
  returnUrl: string;
}

/** Card deposits through Stripe Checkout; the webhook, checked against its signature, is the only thing that marks one paid. */
export class PaymentService {
  private readonly stripe: Stripe | null;

  constructor(
    private readonly dataSource: DataSource,
    private readonly clock: Clock,
    private readonly events: EventBus,
    private readonly options: StripeOptions | undefined,
  ) {
    this.stripe = options
      ? new Stripe(options.secretKey, {
          ...(options.host ? { host: options.host, port: options.port, protocol: 'http' as const } : {}),
          telemetry: false,
          maxNetworkRetries: 0,
        })
      : null;
  }

  get isEnabled(): boolean {
    return this.stripe !== null;
  }

  /** Opens a checkout session for a pending deposit and remembers its id; returns the page the client pays on. */
  async checkout(request: CheckoutRequest): Promise<string> {
    if (!this.stripe) throw errors.unavailable('Card payments are not set up for this firm yet; the firm will send payment details.');
    const { deposit } = request;
    let session: Stripe.Checkout.Session;
    try {
      session = await this.stripe.checkout.sessions.create({
        mode: 'payment',
        currency: 'gbp',
        line_items: [{
          quantity: 1,
          price_data: { currency: 'gbp', unit_amount: deposit.amountPence, product_data: { name: `Deposit for quote ${request.quoteReference}` } },
        }],
        ...(request.clientEmail ? { customer_email: request.clientEmail } : {}),
        client_reference_id: deposit.id,
        metadata: { depositId: deposit.id, firmId: deposit.firmId },
        success_url: `${request.returnUrl}?deposit=paid`,
        cancel_url: `${request.returnUrl}?deposit=cancelled`,
      });
    } catch (error) {
      throw errors.unavailable(`The card payment service did not answer (${error instanceof Error ? error.message : 'unknown error'}); try again shortly.`);
    }
    if (!session.url) throw errors.unavailable('The card payment service returned no payment page.');
    await this.dataSource.manager.update(Deposit, { id: deposit.id, firmId: deposit.firmId }, { checkoutSessionId: session.id });
    return session.url;
  }

  /**
   * Verifies the signature over the exact bytes received before reading anything; a forged or replayed
   * event is refused and changes nothing. A paid session marks its deposit paid once, however often it arrives.
   */
  async handleWebhook(rawBody: Buffer, signature: string | undefined): Promise<{ handled: boolean }> {
    if (!this.stripe || !this.options) throw errors.unavailable('Card payments are not set up.');
    if (!signature) throw errors.validation([{ path: 'stripe-signature', message: 'The signature header is missing' }], 'The event is not signed.');
    let event: Stripe.Event;
    try {
      event = this.stripe.webhooks.constructEvent(rawBody, signature, this.options.webhookSecret);
    } catch {
      throw errors.validation([{ path: 'stripe-signature', message: 'The signature does not match the event' }], 'The event signature is not valid.');
    }
    if (event.type !== 'checkout.session.completed') return { handled: false };
    const session = event.data.object;
    const depositId = session.metadata?.depositId;
    if (!depositId || session.payment_status !== 'paid') return { handled: false };
    const paid = await this.dataSource.transaction(async (manager) => {
      const deposit = await manager.findOne(Deposit, { where: { id: depositId }, lock: { mode: 'pessimistic_write' } });
      // The session must be the one this deposit opened: metadata alone could be copied from another firm's.
      if (!deposit || deposit.checkoutSessionId !== session.id || deposit.status === 'paid') return null;
      if (session.amount_total !== null && session.amount_total !== deposit.amountPence) return null;
      const before = { status: deposit.status };
      deposit.status = 'paid';
      deposit.paidAt = this.clock();
      deposit.paymentReference = typeof session.payment_intent === 'string' ? session.payment_intent : (session.payment_intent?.id ?? session.id);
      await manager.save(deposit);
      await manager.save(manager.create(AuditEvent, {
        firmId: deposit.firmId, actorUserId: null, entity: 'quote', entityId: deposit.quoteId, action: 'deposit-paid',
        before: snapshot(before), after: snapshot({ status: 'paid', amountPence: deposit.amountPence, reference: deposit.paymentReference }),
      }));
      const quote = await manager.findOneByOrFail(Quote, { id: deposit.quoteId });
      return { deposit, quote };
    });
    if (paid) {
      this.events.publish({ firmId: paid.deposit.firmId, type: 'quote:updated', id: paid.quote.id, version: paid.quote.version });
    }
    return { handled: paid !== null };
  }
}
