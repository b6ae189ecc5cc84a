import { Button, Group, Select, Skeleton, Table, Text } from '@mantine/core';
import { notifications } from '@mantine/notifications';
import { useState } from 'react';
import { isApiError } from '@/lib/api-client';
import { useHoldRules } from '../api/get-hold-rules';
import { useProducts } from '../api/get-products';
import { useSetHoldRuleActive } from '../api/update-hold-rule';
import type { HoldRule } from '../api/types';
import { whenText } from '../holds-words';
import { AddRuleModal } from './add-rule-modal';
import classes from './holds.module.css';

/** Hold rules per product: the list, adding one, switching one off (or on again). */
export function HoldRulesPanel() {
  const products = useProducts();
  const [productId, setProductId] = useState<number | null>(null);
  const rules = useHoldRules(productId);
  const [adding, setAdding] = useState(false);
  const toggle = useSetHoldRuleActive();

  const setActive = (rule: HoldRule, active: boolean) =>
    toggle.mutate(
      { id: rule.id, active },
      {
        onSuccess: () => notifications.show({ color: 'signalGreen', title: active ? 'Rule switched on' : 'Rule switched off', message: `${rule.partNumber}: ${rule.description}` }),
        onError: (err) => notifications.show({ color: 'signalRed', title: 'Nothing changed', message: isApiError(err) ? err.message : 'The station server could not be reached.' }),
      },
    );

  return (
    <section aria-label="Hold rules">
      <Group justify="space-between" mb="sm" wrap="wrap">
        <Select
          label="Product"
          placeholder="All products"
          clearable
          w={320}
          data={(products.data ?? []).map((p) => ({ value: String(p.id), label: `${p.partNumber} · ${p.name}` }))}
          value={productId ? String(productId) : null}
          onChange={(v) => setProductId(v ? Number(v) : null)}
        />
        <Button onClick={() => setAdding(true)} disabled={!products.data}>
          Add a rule
        </Button>
      </Group>
      {rules.isPending ? (
        <Skeleton height={120} />
      ) : rules.isError ? (
        <Text c="signalRed">The rules could not be loaded: {rules.error.message}</Text>
      ) : rules.data.length === 0 ? (
        <Text c="dimmed">No hold rule yet{productId ? ' for this product' : ''}. Without one, no lot is held automatically.</Text>
      ) : (
        <div className={classes.tableWrap}>
          <Table aria-label="Hold rules" striped verticalSpacing="sm">
            <Table.Thead>
              <Table.Tr>
                <Table.Th>Product</Table.Th>
                <Table.Th>Rule</Table.Th>
                <Table.Th>Added</Table.Th>
                <Table.Th>Status</Table.Th>
                <Table.Th>Action</Table.Th>
              </Table.Tr>
            </Table.Thead>
            <Table.Tbody>
              {rules.data.map((r) => (
                <Table.Tr key={r.id}>
                  <Table.Td className={classes.mono}>{r.partNumber}</Table.Td>
                  <Table.Td>{r.description}</Table.Td>
                  <Table.Td>
                    {whenText(r.createdAt)}
                    {r.createdByName ? ` by ${r.createdByName}` : ''}
                  </Table.Td>
                  <Table.Td>
                    {/* plain words, not a badge: a badge cuts its label short in a narrow column */}
                    {r.active ? (
                      <Text size="sm" fw={700} c="signalGreen.8" className={classes.nowrap}>
                        Watching
                      </Text>
                    ) : (
                      <Text size="sm" c="dimmed">
                        Switched off {whenText(r.switchedOffAt)}
                      </Text>
                    )}
                  </Table.Td>
                  <Table.Td>
                    <Button size="xs" variant="default" onClick={() => setActive(r, !r.active)} aria-label={`${r.active ? 'Switch off' : 'Switch on'}: ${r.partNumber} ${r.description}`}>
                      {r.active ? 'Switch off' : 'Switch on'}
                    </Button>
                  </Table.Td>
                </Table.Tr>
              ))}
            </Table.Tbody>
          </Table>
        </div>
      )}
      <AddRuleModal opened={adding} onClose={() => setAdding(false)} products={products.data ?? []} productId={productId} />
    </section>
  );
}
