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
  it('name the last line of each record past comments, blank lines and quoted line breaks (a CRLF is one line end)', async () => {
    const path = join(dir, 'lines.csv');
    await writeFile(path, '# logger v2\n\ntime,volts,"a\nb"\n1,2,3\n\n# note\n2,"x\ny\nz",4\r\n3,4,5');
    const lines: number[] = [];
    for await (const r of csvRecords(path, ',')) lines.push(r.line);
    // Counted by hand: the record "2,x..z,4" ends on line 10, "3,4,5" is line 11 (csv-parse, used before, counted CRLF twice).
    expect(lines).toEqual([4, 5, 10, 11]);
  });
});

describe('records', () => {
  it('trims blanks, unquotes fields, skips comments and blank lines, takes CR-only line ends and a BOM', async () => {
    expect(await readAll('\uFEFFtime, volts ,"amps"\r\n# c\r\n\r\n 1 ,"1,5", " 2 ""x"" " # note\r\n')).toEqual([['time', 'volts', 'amps'], ['1', '1,5', ' 2 "x" ']]);
    expect(await readAll('t,v\r0,1\r1,2')).toEqual([['t', 'v'], ['0', '1'], ['1', '2']]);
  });
  it('refuses a record with another number of fields than the header, naming its line', async () => {
    await expect(readAll('t,v,a\n0,1,2\n\n1,2\n')).rejects.toMatchObject({ name: 'InvalidInputError', message: 'line 4: a different number of fields than the header (2, the header has 3)' });
  });
  it('refuses a file without line ends beyond the longest line, naming line 1', async () => {
    await expect(readAll('1,'.repeat(40_000))).rejects.toMatchObject({ name: 'InvalidInputError', message: expect.stringMatching(/^line 1: longer than 65536 bytes/) });
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
