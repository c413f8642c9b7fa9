import { AlignLayerGatherer, type AlignLayerData } from '../core/agreement';
import { AlignColumnsTarget, alignColumnsSize } from '../core/agreement/align-columns';
import { columnsReaderTo } from '../core/formats';
import type { ReadError } from '../core/types';
import { fileStream, formatChoose, readerCreate, type LoadOptions } from './load';

export type LayerLoaded = { ok: true; layer: AlignLayerData; errors: ReadError[] } | { ok: false; message: string };

/**
 * One file as alignment data for `agree`, named by its path. Column files go straight from the
 * scanned text into typed arrays (no Utterance objects); other formats through their reader and
 * `AlignLayerGatherer`. Errors are the reader's either way. `bytes`, when known, sizes the arrays.
 */
export function layerLoad(path: string, options: LoadOptions, bytes = 0): LayerLoaded {
  let done: (() => AlignLayerData) | null = null;
  const loaded = fileStream(path, (head) => {
    const { format, scheme } = formatChoose(path, head, options);
    if (format === 'columns') {
      const target = new AlignColumnsTarget(path, bytes > 0 ? alignColumnsSize(bytes) : undefined);
      done = () => target.done();
      return { ok: true, format, reader: columnsReaderTo(target, scheme === undefined ? {} : { scheme }) };
    }
    const gatherer = new AlignLayerGatherer(path);
    done = () => gatherer.done();
    return readerCreate(path, head, options, (utterance) => gatherer.utteranceAdd(utterance));
  });
  if (!loaded.ok) return loaded;
  const layer = (done as (() => AlignLayerData) | null)?.();
  if (layer === undefined) return { ok: false, message: 'no reader was made for the file' };
  return { ok: true, layer, errors: loaded.document.errors };
}
