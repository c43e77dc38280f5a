import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import type { PhotoDto, ScaffoldInspectionDto } from '@hodboard/shared';
import InspectionRecordList from './InspectionRecordList.vue';

const photo: PhotoDto = {
  id: 'p1', jobId: 'j1', caption: 'Lift 2 toe board', contentType: 'image/jpeg', sizeBytes: 1000, width: 900, height: 600,
  takenAt: null, uploadedAt: '2027-03-02T07:41:00.000Z', uploadedBy: 'Mags Ellery', isLocationRemoved: true,
  thumbUrl: '/api/public/photos/p1/thumb?expires=1&signature=s', originalUrl: '/api/public/photos/p1/original?expires=1&signature=s',
};
const record = (overrides: Partial<ScaffoldInspectionDto> = {}): ScaffoldInspectionDto => ({
  id: 'i1', inspectedAt: '2027-03-02T07:40:00.000Z', inspectorName: 'Mags Ellery', result: 'unsafe', defects: 'Tie at lift 3 loosened',
  notes: null, recordedBy: 'Mags Ellery', photos: [photo], keepUntil: null, isDiscardable: false, ...overrides,
});
const mountList = (records: ScaffoldInspectionDto[], canDiscard = true) =>
  mount(InspectionRecordList, { props: { records, canDiscard }, global: { plugins: [PrimeVue] } });

describe('InspectionRecordList', () => {
  it('shows each record with its result, defects and photo thumbnails linked to the originals', () => {
    const wrapper = mountList([record()]);
    expect(wrapper.text()).toContain('Not safe');
    expect(wrapper.text()).toContain('Tie at lift 3 loosened');
    const link = wrapper.get('a');
    expect(link.attributes('href')).toBe(photo.originalUrl);
    expect(link.get('img').attributes('src')).toBe(photo.thumbUrl);
    expect(link.get('img').attributes('alt')).toBe('Lift 2 toe board');
  });

  it('says records are kept while the access is up, and offers no discard inside the retention period', () => {
    const wrapper = mountList([record()]);
    expect(wrapper.get('[data-testid="inspection-retention"]').text()).toContain('while the access is up and for 3 months after it is struck');
    expect(wrapper.text()).not.toContain('Discard record');
  });

  it('names the date records may be discarded after, and offers the discard once it has passed', async () => {
    const kept = mountList([record({ keepUntil: '2027-06-05' })]);
    expect(kept.get('[data-testid="inspection-retention"]').text()).toContain('Kept until 5 June 2027');
    const due = mountList([record({ keepUntil: '2027-06-05', isDiscardable: true })]);
    await due.get('button').trigger('click');
    expect(due.emitted('discard')?.[0]?.[0]).toMatchObject({ id: 'i1' });
    expect(mountList([record({ keepUntil: '2027-06-05', isDiscardable: true })], false).text()).not.toContain('Discard record');
  });
});
