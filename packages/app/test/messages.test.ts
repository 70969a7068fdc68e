import { describe, expect, it } from 'vitest';
import { mainsSyncSpec } from '@loopwright/dsp';
import { describeError, ApiError } from '../src/api/client.ts';
import { fieldMessage } from '../src/lib/messages.ts';
import { checkDraft } from '../src/form/specValidation.ts';
import { specToDraft } from '../src/form/specDraft.ts';

// Each message a person reads is one sentence naming the field by its on-screen label, with the
// bound's unit (common practice, no source). The inputs are the raw messages the layers below wrote.
describe('messages a person reads', () => {
  it('turns a schema bound into a sentence with the label and unit', () => {
    expect(fieldMessage('fixedPoint.coefficientBits', 'fixedPoint.coefficientBits: must be at least 2')).toBe('Coefficient width must be at least 2 bits.');
    expect(fieldMessage('filter.naturalHz', 'missing (expected a number)')).toBe('Natural frequency is empty: enter a number.');
    expect(fieldMessage('filter.damping', 'must be above 0')).toBe('Damping ζ must be above 0.');
  });

  it('names spec paths inside a message by their labels, values with their units', () => {
    expect(fieldMessage('sampleRateHz', 'sampleRateHz 2000000 exceeds clockHz 1000000: the loop cannot update faster than the fabric clock')).toBe(
      'Loop update rate (2 MHz) exceeds fabric clock (1 MHz): the loop cannot update faster than the fabric clock.',
    );
    expect(fieldMessage('centerHz', 'centerHz 6000 must be below sampleRateHz/2 = 5000')).toBe('NCO centre frequency (6 kHz) must be below half the loop update rate = 5000.');
  });

  it('says a server refusal once, by label, and never names a link token', () => {
    expect(describeError(new ApiError(400, 'invalid_input', 'password: must be at least 10 characters', 'password'))).toBe('Password must be at least 10 characters.');
    expect(describeError(new ApiError(409, 'conflict', 'this review link was already used; each link decides once', 'token'))).toBe('This review link was already used; each link decides once.');
    expect(describeError(new ApiError(400, 'invalid_input', 'newPassword: must be at least 10 characters', 'newPassword'))).toBe('New password must be at least 10 characters.');
    // An uploaded spec's field is named under "file." by the API; the reader sees the form's label.
    expect(describeError(new ApiError(400, 'invalid_input', 'sampleRateHz: must be above 0', 'file.sampleRateHz'))).toBe('Loop update rate must be above 0 Hz.');
  });

  it('shows the spec form a sentence under the field, not zod\'s "Too small: expected number to be >=2"', () => {
    const draft = { ...specToDraft(mainsSyncSpec), 'fixedPoint.coefficientBits': '1' };
    const check = checkDraft(draft);
    expect(check.errors['fixedPoint.coefficientBits']).toBe('Coefficient width must be at least 2 bits.');
    const empty = checkDraft({ ...specToDraft(mainsSyncSpec), clockHz: '' });
    expect(empty.errors['clockHz']).toBe('Fabric clock is empty: enter a number.');
  });
});
