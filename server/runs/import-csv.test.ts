import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { csvRecords, pickDelimiter, sniffDelimiter } from './import-csv.js';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'kp-import-csv-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function readAll(text: string | Buffer, delimiter: ',' | ';' = ',') {
  const path = join(dir, `f${Math.random().toString(36).slice(2)}.csv`);
  await writeFile(path, text);
  const out: string[][] = [];
  for await (const r of csvRecords(path, delimiter)) out.push(r.fields);
  return out;
}

describe('csv errors become 400s naming the line', () => {
  it('a stray quote inside a field (1,1"3,5)', async () => {
    await expect(readAll('t,v,a\n0,13,5\n1,1"3,5\n')).rejects.toMatchObject({ name: 'InvalidInputError', message: expect.stringMatching(/^line 3: a quote inside an unquoted field/) });
  });
  it('text after a closing quote, and a quote never closed', async () => {
    await expect(readAll('t,v,a\n1,"13"x,5\n')).rejects.toMatchObject({ name: 'InvalidInputError', message: expect.stringMatching(/^line 2: text after a closing quote/) });
    await expect(readAll('t,v,a\n1,"13,5\n')).rejects.toMatchObject({ name: 'InvalidInputError', message: expect.stringMatching(/^line 2: a quote that is never closed/) });
  });
  it('a binary file is refused before parsing (a NUL byte), naming its line', async () => {
    const path = join(dir, 'bin.xlsx');
    await writeFile(path, Buffer.concat([Buffer.from('PK\u0003\u0004\nab\n'), Buffer.from([0, 1, 2, 0x22, 0xff])]));
    await expect(sniffDelimiter(path)).rejects.toMatchObject({ name: 'InvalidInputError', message: 'line 3: binary data (a NUL byte); this is not a CSV text log' });
  });
});

describe('line numbers', () => {
  it('name the last line of each record past comments, blank lines and quoted line breaks (as csv-parse counts them)', async () => {
    const path = join(dir, 'lines.csv');
    await writeFile(path, '# logger v2\n\ntime,volts,"a\nb"\n1,2,3\n\n# note\n2,"x\ny\nz",4\r\n3,4,5');
    const lines: number[] = [];
    for await (const r of csvRecords(path, ',')) lines.push(r.line);
    expect(lines).toEqual([4, 5, 11, 12]);
  });
});

describe('delimiter', () => {
  it('picks ; for a semicolon file whose headers hold commas', () => {
    expect(pickDelimiter('Time, s;Voltage, V;Current, A;Temp, °C\n0;13,2;5,1;20\n1;13,1;5,1;20\n2;13,0;5,1;20\n')).toBe(';');
  });
  it('picks ; for decimal commas, tab for tabs, and , for a plain comma file with a stray ; in the header', () => {
    expect(pickDelimiter('time;volts;amps\n0;13,2;5,5\n1;13,1;5,5\n')).toBe(';');
    expect(pickDelimiter('time\tvolts\tamps\n0\t13.2\t5\n')).toBe('\t');
    expect(pickDelimiter('time,volts;raw,amps\n0,13.2,5\n1,13.1,5\n')).toBe(',');
  });
});
