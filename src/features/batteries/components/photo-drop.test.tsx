import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { act, fireEvent, render, screen } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { resetCsrfToken } from '../../../lib/api-client';
import { PhotoDrop } from './photo-drop';

/** A stand-in XMLHttpRequest that the test drives: progress events, then the server's answer. */
class FakeXhr {
  static last: FakeXhr | null = null;
  upload: { onprogress: ((e: { lengthComputable: boolean; loaded: number; total: number }) => void) | null } = { onprogress: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  status = 0;
  responseText = '';
  withCredentials = false;
  method = '';
  url = '';
  headers: Record<string, string> = {};
  body: FormData | null = null;
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(name: string, value: string) {
    this.headers[name] = value;
  }
  send(body: FormData) {
    this.body = body;
    FakeXhr.last = this;
  }
  answer(status: number, body: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.onload?.();
  }
}

const photoAnswer = {
  photo: { id: 3, batteryId: 4, itemId: 2, fileName: 'weld.jpg', widthPx: 10, heightPx: 10, bytes: 100, createdBy: 7, createdAt: '2026-12-01T20:00:00Z',
    urls: { thumb: '/api/photos/3/thumb', web: '/api/photos/3/web', full: '/api/photos/3/full' } },
};

function renderDrop() {
  render(
    <QueryClientProvider client={new QueryClient()}>
      <PhotoDrop batteryId={4} itemId={2} label="Add photos: welds" />
    </QueryClientProvider>,
  );
}
const file = (name: string) => new File([new Uint8Array([0xff, 0xd8, 0xff, 0xe0])], name, { type: 'image/jpeg' });
const sent = async () => {
  await vi.waitFor(() => expect(FakeXhr.last).not.toBeNull());
  return FakeXhr.last!;
};

beforeEach(() => {
  FakeXhr.last = null;
  resetCsrfToken();
  vi.stubGlobal('XMLHttpRequest', FakeXhr);
  vi.stubGlobal('fetch', vi.fn(async () => new Response(JSON.stringify({ csrfToken: 'upload-token' }), { status: 200 })));
});
afterEach(() => vi.unstubAllGlobals());

describe('PhotoDrop', () => {
  it('sends a dropped photo with its item and the CSRF token, showing a progress bar until it is stored', async () => {
    renderDrop();
    fireEvent.drop(screen.getByTestId('photo-drop'), { dataTransfer: { files: [file('weld.jpg')] } });
    const xhr = await sent();
    expect([xhr.method, xhr.url, xhr.headers['X-CSRF-Token']]).toEqual(['POST', '/api/batteries/4/photos', 'upload-token']);
    expect(xhr.body!.get('item')).toBe('2');
    expect((xhr.body!.get('file') as File).name).toBe('weld.jpg');
    act(() => xhr.upload.onprogress!({ lengthComputable: true, loaded: 30, total: 120 }));
    expect((screen.getByRole('progressbar', { name: 'Uploading weld.jpg' }) as HTMLProgressElement).value).toBe(25);
    act(() => xhr.answer(201, photoAnswer));
    await vi.waitFor(() => expect(screen.queryByRole('progressbar')).toBeNull());
  });

  it("says why the server refused a file", async () => {
    renderDrop();
    fireEvent.change(screen.getByLabelText('Add photos: welds'), { target: { files: [file('notes.jpg')] } });
    const xhr = await sent();
    act(() => xhr.answer(400, { error: { message: 'Not a JPEG, PNG or WebP image (judged by the file content)' } }));
    expect((await screen.findByRole('alert')).textContent).toBe('notes.jpg: Not a JPEG, PNG or WebP image (judged by the file content)');
  });
});
