import { describe, expect, it } from 'vitest';
import { clientInputSchema, crewInputSchema, siteInputSchema, type Problem } from '@hodboard/shared';
import { ApiError } from '@/api/http';
import { issuesToFieldErrors, normaliseProblemPath, problemToFieldErrors, useFormErrors } from './use-form-errors';

describe('issuesToFieldErrors', () => {
  it('keys each message by its dotted path and keeps the first per field', () => {
    expect(
      issuesToFieldErrors([
        { path: ['name'], message: 'Name is required' },
        { path: ['name'], message: 'At most 80 characters' },
        { path: ['memberIds', 2], message: 'Must be a valid id' },
        { path: [], message: 'Whole form is wrong' },
      ]),
    ).toEqual({ name: 'Name is required', 'memberIds.2': 'Must be a valid id', form: 'Whole form is wrong' });
  });
});

describe('normaliseProblemPath', () => {
  it.each([
    ['postcode', 'postcode'],
    ['/postcode', 'postcode'],
    ['body.email', 'email'],
    ['/memberIds/0', 'memberIds.0'],
    ['query.pageSize', 'pageSize'],
    ['(body)', ''],
    ['(root)', ''],
  ])('reads %s as %s', (input, expected) => {
    expect(normaliseProblemPath(input)).toBe(expected);
  });
});

describe('problemToFieldErrors', () => {
  it('maps API errors[] to fields', () => {
    expect(problemToFieldErrors([{ path: 'body.name', message: 'Client name is required' }])).toEqual({
      name: 'Client name is required',
    });
    expect(problemToFieldErrors(undefined)).toEqual({});
  });
});

describe('useFormErrors', () => {
  it('returns parsed data and clears errors when the shared schema accepts the input', () => {
    const form = useFormErrors();
    form.errors.value = { name: 'old' };
    const parsed = form.validate(clientInputSchema, { name: '  Orchard Lane Homes ', contacts: [{ name: 'Ruth Ambler', email: '' }] });
    expect(parsed).toMatchObject({ name: 'Orchard Lane Homes', contacts: [{ name: 'Ruth Ambler', email: null }] });
    expect(form.errors.value).toEqual({});
  });

  it('shows shared schema messages against the fields that failed', () => {
    const form = useFormErrors();
    const parsed = form.validate(siteInputSchema, {
      clientId: 'not-an-id',
      addressLine1: '',
      town: 'Hebden Bridge',
      postcode: '12345',
    });
    expect(parsed).toBeNull();
    expect(form.errorFor('addressLine1')).toBe('Address is required');
    expect(form.errorFor('postcode')).toBe('Enter a UK postcode like LS6 2AB');
    expect(form.errorFor('clientId')).toBe('Must be a valid id');
    expect(form.errorFor('town')).toBeUndefined();
  });

  it('finds nested item errors under their list field', () => {
    const form = useFormErrors();
    form.validate(crewInputSchema, { name: 'South', colour: '#112233', memberIds: ['nope'] });
    expect(form.errorFor('memberIds')).toBe('Must be a valid id');
    form.clear('memberIds');
    expect(form.errorFor('memberIds')).toBeUndefined();
  });

  it('applies a problem with field errors and declines one without', () => {
    const form = useFormErrors();
    const withFields: Problem = {
      type: 'about:blank',
      title: 'Some details need fixing',
      status: 400,
      code: 'validation-failed',
      errors: [{ path: '/email', message: 'Enter a valid e-mail address' }],
    };
    expect(form.applyProblem(new ApiError(withFields))).toBe(true);
    expect(form.errorFor('email')).toBe('Enter a valid e-mail address');

    const withoutFields: Problem = { type: 'about:blank', title: 'Not allowed', status: 403, code: 'forbidden' };
    expect(form.applyProblem(new ApiError(withoutFields))).toBe(false);
    expect(form.applyProblem(new Error('boom'))).toBe(false);
    const wholeBody: Problem = { ...withoutFields, status: 400, code: 'validation-failed', errors: [{ path: '(body)', message: 'The body is not valid JSON' }] };
    expect(form.applyProblem(new ApiError(wholeBody))).toBe(false);
    expect(form.errorFor('email')).toBe('Enter a valid e-mail address');
  });
});
