import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import { checkRead, type SampleSource } from '../signals/sample-source.js';
import { bytesPerSample, decodeSamples, encodingOf } from '../signals/sample-encoding.js';
import type { SignalMeta } from './store.js';

/** Stored bytes read per readSync: a source holds one buffer of at most this size, whatever the signal's size. */
export const READ_BLOCK_BYTES = 4 * 1024 * 1024;

/**
 * A {@link SampleSource} over a file of samples as stored ([epoch][channel][sample], little-endian,
 * in the meta's encoding). Each read takes the row span from the file in blocks of at most
 * {@link READ_BLOCK_BYTES} and converts them to float64 into the caller's array.
 *
 * @param onClose - runs once when the source is closed, after the file is (a spooled copy removes itself)
 * @throws Error when the file does not hold `meta.bytes` bytes
 */
export function openSampleFile(path: string, meta: SignalMeta, onClose: () => void = () => {}): SampleSource {
  const encoding = encodingOf(meta);
  const width = bytesPerSample(encoding);
  const channelCount = meta.channels.length;
  const { samplesPerEpoch } = meta;
  const expected = meta.epochCount * channelCount * samplesPerEpoch * width;
  let fd: number | null = openSync(path, 'r');
  try {
    const size = fstatSync(fd).size;
    if (size !== expected || meta.bytes !== expected) throw new Error(`stored samples of ${meta.id} have ${size} bytes, expected ${expected} (${meta.bytes} in its meta)`);
  } catch (error) {
    closeSync(fd);
    onClose();
    throw error;
  }
  let scratch: Uint8Array | null = null;
  return {
    samplingRate: meta.samplingRate,
    channels: meta.channels,
    unit: meta.unit,
    epochCount: meta.epochCount,
    samplesPerEpoch,
    ...(meta.events.length > 0 ? { events: meta.events } : {}),
    readRow(epoch, channel, from, to, into) {
      if (fd === null) throw new Error('the sample source is closed');
      checkRead(meta, epoch, channel, from, to, into);
      // A fresh ArrayBuffer is aligned for any sample width, as decodeSamples needs.
      scratch ??= new Uint8Array(Math.min(READ_BLOCK_BYTES, Math.max(8, samplesPerEpoch * width)));
      const perBlock = Math.floor(scratch.length / width);
      let position = ((epoch * channelCount + channel) * samplesPerEpoch + from) * width;
      for (let done = 0; done < to - from; ) {
        const count = Math.min(perBlock, to - from - done);
        readFully(fd, scratch, count * width, position, meta.id);
        decodeSamples(encoding, channel, scratch, count, into.subarray(done, done + count));
        done += count;
        position += count * width;
      }
    },
    close() {
      if (fd === null) return;
      closeSync(fd);
      fd = null;
      scratch = null;
      onClose();
    },
  };
}

function readFully(fd: number, buffer: Uint8Array, length: number, position: number, id: string): void {
  for (let done = 0; done < length; ) {
    const read = readSync(fd, buffer, done, length - done, position + done);
    if (read === 0) throw new Error(`stored samples of ${id} end at byte ${position + done}, before the ${length} bytes read from ${position}`);
    done += read;
  }
}
