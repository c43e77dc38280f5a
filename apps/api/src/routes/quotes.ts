import express, { Router, type Response } from 'express';
import {
  idParamsSchema,
  quoteAcceptSchema,
  quoteCreateSchema,
  quoteDeclineSchema,
  quoteListQuerySchema,
  quotePdfQuerySchema,
  quoteSendSchema,
  quoteTokenParamsSchema,
  quoteUpdateSchema,
  quoteVersionOnlySchema,
} from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { PaymentService } from '../services/payment-service.js';
import type { QuotePdf, QuoteService } from '../services/quote-service.js';

function sendPdf(res: Response, pdf: QuotePdf, disposition: 'inline' | 'attachment'): void {
  res
    .status(200)
    .type('application/pdf')
    .set('Content-Disposition', `${disposition}; filename="${pdf.filename}"`)
    .set('Cache-Control', 'private, no-store')
    .send(pdf.body);
}

export function quotesRouter(quotes: QuoteService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: quoteListQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await quotes.list(actor, query));
  }));
  router.post('/', ...endpoint({ body: quoteCreateSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await quotes.create(actor, body));
  }));
  router.get('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    res.json(await quotes.get(actor, params.id));
  }));
  router.put('/:id', ...endpoint({ params: idParamsSchema, body: quoteUpdateSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await quotes.update(actor, params.id, body));
  }));
  router.post('/:id/send', ...endpoint({ params: idParamsSchema, body: quoteSendSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await quotes.send(actor, params.id, body));
  }));
  router.post('/:id/revise', ...endpoint({ params: idParamsSchema, body: quoteVersionOnlySchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await quotes.revise(actor, params.id, body));
  }));
  router.get('/:id/pdf', ...endpoint({ params: idParamsSchema, query: quotePdfQuerySchema }, async ({ actor, params, query }, req, res) => {
    sendPdf(res, await quotes.pdf(actor, params.id, query.version), req.query.download ? 'attachment' : 'inline');
  }));
  return router;
}

/** What the client reaches from the e-mailed link, without an account: the token is the only key. */
export function publicQuotesRouter(quotes: QuoteService): Router {
  const router = Router();
  router.get('/:token', ...endpoint({ params: quoteTokenParamsSchema }, async ({ params }, _req, res) => {
    res.set('Cache-Control', 'no-store').json(await quotes.publicView(params.token));
  }));
  router.get('/:token/pdf', ...endpoint({ params: quoteTokenParamsSchema }, async ({ params }, req, res) => {
    sendPdf(res, await quotes.publicPdf(params.token), req.query.download ? 'attachment' : 'inline');
  }));
  router.post('/:token/accept', ...endpoint({ params: quoteTokenParamsSchema, body: quoteAcceptSchema }, async ({ params, body }, req, res) => {
    res.json(await quotes.accept(params.token, body, req.ip ?? req.socket.remoteAddress ?? 'unknown'));
  }));
  router.post('/:token/decline', ...endpoint({ params: quoteTokenParamsSchema, body: quoteDeclineSchema }, async ({ params, body }, _req, res) => {
    res.json(await quotes.decline(params.token, body));
  }));
  router.post('/:token/deposit', ...endpoint({ params: quoteTokenParamsSchema }, async ({ params }, _req, res) => {
    res.json(await quotes.depositCheckout(params.token));
  }));
  return router;
}

/**
 * Stripe signs the exact bytes it sends, so this route reads the raw body and must be mounted before the
 * app-wide JSON parser.
 */
export function stripeWebhookRouter(payments: PaymentService): Router {
  const router = Router();
  router.post('/', express.raw({ type: () => true, limit: '512kb' }), async (req, res, next) => {
    try {
      const body = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
      const result = await payments.handleWebhook(body, req.get('stripe-signature'));
      res.json({ received: true, ...result });
    } catch (error) {
      next(error);
    }
  });
  return router;
}
