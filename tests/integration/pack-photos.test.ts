import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { crc32, deflateSync } from 'node:zlib';
import exifr from 'exifr';
import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PhotoSchema } from '../../shared/schemas/inspection.js';
import { THUMB_EDGE_PX, WEB_EDGE_PX } from '../../server/photos/photo-processing.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

let t: TestContext;
let dataDir: string;
let tech: SignedInAgent;
let admin: SignedInAgent;
let viewer: SignedInAgent;
let batteryId: number;
let firstItemId: number;

beforeAll(async () => {
  // Under a dot folder, as the default data folder (.data) is: serving must still work there.
  dataDir = join(mkdtempSync(join(tmpdir(), 'kneepoint-photos-')), '.data');
  t = await createTestContext({ config: { dataDir } });
  [tech, admin, viewer] = await Promise.all([signInAs(t, 'technician'), signInAs(t, 'admin'), signInAs(t, 'viewer')]);
  // Invented demo figures (a fictional 8s LFP pack).
  const pack = { label: 'NG-0177', brand: 'Fenwick Cells', chemistry: 'lfp', cellsInSeries: 8, ratedAh: 50 };
  batteryId = (await tech.post('/api/batteries').send(pack).expect(201)).body.battery.id;
  firstItemId = (await viewer.get('/api/inspection-items').expect(200)).body.items[0].id;
});
afterAll(async () => {
  await t?.close();
  rmSync(dirname(dataDir), { recursive: true, force: true });
});

const photoDir = () => join(dataDir, 'photos');
const storedFiles = () => readdirSync(photoDir());
const photoRows = async () => Number((await t.ctx.sequelize.query('SELECT COUNT(*) AS n FROM battery_photos', { plain: true }))!.n);
/** Every file anywhere under the data folder (to prove an upload wrote nothing anywhere). */
const everyFile = (dir: string = dataDir): string[] =>
  readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? everyFile(join(dir, e.name)) : [join(dir, e.name)]));

// A GPS position and camera written the way a phone writes them (EXIF 2.3 IFD0 Make/Model, GPS IFD).
const CAMERA_EXIF = {
  IFD0: { Make: 'Testmaker', Model: 'Bench Cam 7', Software: 'cam-fw 1.0' },
  IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 1234/100', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 3900/100' },
};

/** A 2400 × 1800 photo carrying EXIF GPS and camera fields, in `format`. */
async function photoWithGps(format: 'jpeg' | 'webp' | 'png'): Promise<Buffer> {
  const image = sharp({ create: { width: 2400, height: 1800, channels: 3, background: '#6a5040' } });
  return image[format]().withExif(CAMERA_EXIF).toBuffer();
}

/** A PNG whose header claims `side` × `side` px with a few bytes of pixel data (a decompression bomb's shape). */
function pngClaiming(side: number): Buffer {
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type, 'latin1'), data]);
    const length = Buffer.alloc(4);
    length.writeUInt32BE(data.length);
    const crc = Buffer.alloc(4);
    crc.writeUInt32BE(crc32(body));
    return Buffer.concat([length, body, crc]);
  };
  const header = Buffer.alloc(13);
  header.writeUInt32BE(side, 0);
  header.writeUInt32BE(side, 4);
  header.set([8, 2, 0, 0, 0], 8); // 8-bit RGB, deflate, no filter, no interlace (PNG spec, IHDR)
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', header), chunk('IDAT', deflateSync(Buffer.alloc(1024))), chunk('IEND', Buffer.alloc(0)),
  ]);
}

const fetchCopy = async (agent: SignedInAgent, url: string) =>
  (await agent.get(url).buffer(true).parse((res, done) => {
    const parts: Buffer[] = [];
    res.on('data', (part: Buffer) => parts.push(part));
    res.on('end', () => done(null, Buffer.concat(parts)));
  }).expect(200)).body as Buffer;

describe('POST /api/batteries/:id/photos', () => {
  it('keeps no location or camera data in any stored copy, and makes the promised sizes', async () => {
    const original = await photoWithGps('jpeg');
    // The check is only meaningful if the upload carries GPS: exifr reads it back from the source.
    expect((await exifr.gps(original))?.latitude).toBeCloseTo(51 + 30 / 60 + 12.34 / 3600, 6);
    const res = await tech.post(`/api/batteries/${batteryId}/photos`).field('item', String(firstItemId)).attach('file', original, 'welds.jpg').expect(201);
    const photo = PhotoSchema.parse(res.body.photo);
    expect(photo).toMatchObject({ batteryId, itemId: firstItemId, fileName: 'welds.jpg', widthPx: 2400, heightPx: 1800 });

    const expected = { thumb: [THUMB_EDGE_PX, 240], web: [WEB_EDGE_PX, 1200], full: [2400, 1800] } as const;
    for (const variant of ['thumb', 'web', 'full'] as const) {
      const copy = await fetchCopy(viewer, photo.urls[variant]);
      const parsed = await exifr.parse(copy, { tiff: true, gps: true, exif: true, xmp: true, iptc: true, ifd1: true });
      expect(parsed?.latitude, variant).toBeUndefined();
      expect(parsed?.Make, variant).toBeUndefined();
      expect(parsed?.Model, variant).toBeUndefined();
      const meta = await sharp(copy).metadata();
      expect([meta.width, meta.height], variant).toEqual(expected[variant]);
      expect(meta.exif, variant).toBeUndefined();
    }
    // The files themselves (not only what the route serves): random names, no metadata.
    const files = storedFiles(); // the first upload of this file's data folder
    expect(files.length).toBe(3);
    for (const name of files) {
      expect(name).toMatch(/^[0-9a-f]{32}-(thumb|web|full)\.jpg$/);
      expect(await exifr.gps(join(photoDir(), name)).catch(() => undefined)).toBeUndefined();
    }
  });

  it('strips the metadata of a WebP upload from its full-size WebP copy too', async () => {
    const original = await photoWithGps('webp');
    expect((await sharp(original).metadata()).exif).toBeDefined();
    const res = await tech.post(`/api/batteries/${batteryId}/photos`).attach('file', original, 'case.webp').expect(201);
    const full = await fetchCopy(tech, res.body.photo.urls.full);
    const meta = await sharp(full).metadata();
    expect(meta.format).toBe('webp');
    expect(meta.exif).toBeUndefined();
    expect(meta.xmp).toBeUndefined();
    await tech.delete(`/api/photos/${res.body.photo.id}`).expect(204);
  });

  it('ignores path characters in the file name', async () => {
    const before = everyFile().length;
    const res = await tech.post(`/api/batteries/${batteryId}/photos`).attach('file', await photoWithGps('png'), '../../escape/../evil.png').expect(201);
    expect(res.body.photo.fileName).toBe('evil.png');
    const after = everyFile();
    expect(after.length).toBe(before + 3);
    expect(after.every((path) => path.startsWith(photoDir()) || !path.includes('evil'))).toBe(true);
    expect(after.some((path) => path.includes('evil'))).toBe(false);
    await admin.delete(`/api/photos/${res.body.photo.id}`).expect(204);
    expect(everyFile().length).toBe(before);
  });

  describe('refuses bad input and stores nothing', () => {
    const refused = async (send: () => Promise<{ status: number }>, status: number) => {
      const files = everyFile().length;
      const rows = await photoRows();
      const res = await send();
      expect(res.status).toBe(status);
      expect(everyFile().length).toBe(files);
      expect(await photoRows()).toBe(rows);
      return res;
    };

    it('a text file named .jpg: 400', async () => {
      const res = await refused(() => tech.post(`/api/batteries/${batteryId}/photos`).attach('file', Buffer.from('not a photo at all\n'.repeat(50)), 'board.jpg'), 400);
      expect((res as unknown as { body: { error: { message: string } } }).body.error.message).toMatch(/JPEG, PNG or WebP/);
    });

    it('a GIF (a real image, not an accepted format) named .png: 400', async () => {
      const gif = await sharp({ create: { width: 8, height: 8, channels: 3, background: '#000' } }).gif().toBuffer();
      await refused(() => tech.post(`/api/batteries/${batteryId}/photos`).attach('file', gif, 'leads.png'), 400);
    });

    it('a JPEG cut off after its header: 400', async () => {
      const whole = await photoWithGps('jpeg');
      await refused(() => tech.post(`/api/batteries/${batteryId}/photos`).attach('file', whole.subarray(0, 2000), 'cut.jpg'), 400);
    });

    it('a 25 MB file: 413', async () => {
      const big = Buffer.alloc(25 * 1024 * 1024, 7);
      big.set([0xff, 0xd8, 0xff, 0xe0]);
      await refused(() => tech.post(`/api/batteries/${batteryId}/photos`).attach('file', big, 'huge.jpg'), 413);
    });

    it('a decompression bomb (60000 × 60000 px declared in a tiny PNG): 400 without decoding it', async () => {
      const bomb = pngClaiming(60_000);
      expect(bomb.length).toBeLessThan(2000);
      const res = await refused(() => tech.post(`/api/batteries/${batteryId}/photos`).attach('file', bomb, 'bomb.png'), 400);
      expect((res as unknown as { body: { error: { message: string } } }).body.error.message).toMatch(/60000 × 60000/);
    });

    it('an upload by a viewer: 403', async () => {
      await refused(async () => viewer.post(`/api/batteries/${batteryId}/photos`).attach('file', await photoWithGps('jpeg'), 'v.jpg'), 403);
    });

    it('an unknown checklist item, a missing file, an unknown pack: 400, 400, 404', async () => {
      const photo = await photoWithGps('jpeg');
      await refused(() => tech.post(`/api/batteries/${batteryId}/photos`).field('item', '99999').attach('file', photo, 'a.jpg'), 400);
      await refused(() => tech.post(`/api/batteries/${batteryId}/photos`).field('item', '1'), 400);
      await refused(() => tech.post('/api/batteries/99999/photos').attach('file', photo, 'a.jpg'), 404);
    });
  });

  it('serves copies only to signed-in users and lets only the author or an admin delete', async () => {
    const res = await tech.post(`/api/batteries/${batteryId}/photos`).attach('file', await photoWithGps('jpeg'), 'x.jpg').expect(201);
    const { id, urls } = res.body.photo;
    await request(t.url).get(urls.thumb).expect(401);
    await viewer.get(`/api/photos/${id}/original`).expect(404);
    await viewer.delete(`/api/photos/${id}`).expect(403);
    // A second technician, not the author, may not delete it.
    const other = { email: 'tech2@test.lab', name: 'Second Technician', role: 'technician', password: 'second-tech-password' };
    await admin.post('/api/users').send(other).expect(201);
    const tech2 = await signInAs(t, 'technician', { email: other.email, password: other.password });
    await tech2.delete(`/api/photos/${id}`).expect(403);
    const listed = (await viewer.get(`/api/batteries/${batteryId}/photos`).expect(200)).body.photos.map((p: { id: number }) => p.id);
    expect(listed).toContain(id);
    await tech.delete(`/api/photos/${id}`).expect(204);
    await viewer.get(urls.web).expect(404);
  });
});
