import { Alert, Button, Group, Modal, NumberInput, SegmentedControl, Select, Stack, Text, Textarea, TextInput } from '@mantine/core';
import { useState } from 'react';
import { isApiError } from '@/lib/api-client';
import { useCreateLot, useProducts } from '../api/lots-api';
import type { LotDetail, NewLotSerials } from '../api/types';

type Mode = NewLotSerials['kind'];

/** An example serial of a product (`^K5A-\d{4}-\d{5}$` → `K5A-2649-00001`), shown as a placeholder. */
export function exampleSerial(pattern: string): string {
  const m = /^\^(.*)\\d\{4\}(.*)\\d\{5\}(.*)\$$/.exec(pattern);
  if (!m) return '';
  const un = (s: string) => s.replace(/\\(.)/g, '$1');
  return `${un(m[1])}2649${un(m[2])}00001${un(m[3])}`;
}

/** Serials typed or pasted into the list: commas, semicolons, spaces and line breaks separate them. */
export function splitSerials(text: string): string[] {
  return text.split(/[\s,;]+/).filter((s) => s.length > 0);
}

interface NewLotModalProps {
  opened: boolean;
  onClose: () => void;
  onCreated: (lot: LotDetail) => void;
}

/** "New lot": code, product, planned quantity and its serials (next free ones, a range, or a list). */
export function NewLotModal({ opened, onClose, onCreated }: NewLotModalProps) {
  const products = useProducts();
  const create = useCreateLot();
  const [code, setCode] = useState('');
  const [productId, setProductId] = useState<string | null>(null);
  const [quantity, setQuantity] = useState<number | string>('');
  const [mode, setMode] = useState<Mode>('range');
  const [first, setFirst] = useState('');
  const [last, setLast] = useState('');
  const [list, setList] = useState('');

  const product = products.data?.find((p) => String(p.id) === productId);
  const example = product ? exampleSerial(product.serialPattern) : 'K5A-2649-00001';
  const problems = isApiError(create.error) ? create.error.fieldProblems : [];
  const problemOf = (field: string) => problems.find((p) => p.field === field)?.problems.join('; ');
  const listed = splitSerials(list);

  const close = () => {
    create.reset();
    onClose();
  };
  const submit = () => {
    if (!productId) return;
    const serials: NewLotSerials = mode === 'range' ? { kind: 'range', firstSerial: first, lastSerial: last } : mode === 'list' ? { kind: 'list', serials: listed } : { kind: 'next' };
    create.mutate(
      { code, productId: Number(productId), plannedQuantity: Number(quantity), serials },
      {
        onSuccess: (lot) => {
          onCreated(lot);
          setCode('');
          setFirst('');
          setLast('');
          setList('');
          setQuantity('');
          create.reset();
        },
      },
    );
  };
  const ready = code.trim().length > 0 && productId !== null && Number(quantity) >= 1 && (mode !== 'range' || (first.trim() && last.trim())) && (mode !== 'list' || listed.length > 0);

  return (
    <Modal opened={opened} onClose={close} title="New lot" size="lg">
      <form
        onSubmit={(e) => {
          e.preventDefault();
          submit();
        }}
      >
        <Stack gap="sm">
          <Group grow align="flex-start">
            <TextInput label="Lot code" placeholder="LB-2649-04" description="Capital letters, digits and “-”" value={code} onChange={(e) => setCode(e.currentTarget.value.toUpperCase())} error={problemOf('code')} required />
            <NumberInput label="Planned quantity" min={1} max={10_000} allowDecimal={false} value={quantity} onChange={setQuantity} error={problemOf('plannedQuantity')} required />
          </Group>
          <Select
            label="Product"
            placeholder={products.isPending ? 'Loading products…' : 'Choose a product'}
            data={(products.data ?? []).filter((p) => p.active).map((p) => ({ value: String(p.id), label: `${p.partNumber} — ${p.name}` }))}
            value={productId}
            onChange={setProductId}
            error={problemOf('productId')}
            searchable
            required
          />
          <div>
            <Text size="sm" fw={500} mb={4} id="serials-how">
              Serials
            </Text>
            <SegmentedControl
              aria-labelledby="serials-how"
              value={mode}
              onChange={(v) => setMode(v as Mode)}
              data={[
                { value: 'range', label: 'A range' },
                { value: 'list', label: 'A list' },
                { value: 'next', label: 'Next free this week' },
              ]}
            />
          </div>
          {mode === 'range' && (
            <Group grow align="flex-start">
              <TextInput label="First serial" placeholder={example} value={first} onChange={(e) => setFirst(e.currentTarget.value)} error={problemOf('firstSerial')} ff="monospace" />
              <TextInput label="Last serial" placeholder={example.replace(/00001/, '00120')} value={last} onChange={(e) => setLast(e.currentTarget.value)} error={problemOf('lastSerial')} ff="monospace" />
            </Group>
          )}
          {mode === 'list' && (
            <Textarea
              label="Serials"
              description={`One per line, or separated by commas or spaces (${listed.length} given)`}
              placeholder={example}
              rows={5}
              value={list}
              onChange={(e) => setList(e.currentTarget.value)}
              error={problemOf('serials')}
              ff="monospace"
            />
          )}
          {mode === 'next' && (
            <Text size="sm" c="dimmed">
              The lot takes the next free serials of this week in the product’s format{product ? `, e.g. ${example.replace('2649', 'YYWW')}` : ''}.
            </Text>
          )}
          {create.isError && (
            <Alert color="signalRed" variant="light" role="alert" title="The lot was not created">
              {create.error.message}
            </Alert>
          )}
          <Group justify="flex-end" mt="xs">
            <Button variant="default" onClick={close}>
              Cancel
            </Button>
            <Button type="submit" disabled={!ready} loading={create.isPending}>
              Create lot
            </Button>
          </Group>
        </Stack>
      </form>
    </Modal>
  );
}
