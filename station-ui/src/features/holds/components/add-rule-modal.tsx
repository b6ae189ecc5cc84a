import { Alert, Button, Group, Modal, NumberInput, Select, Stack, Text } from '@mantine/core';
import { useForm } from '@mantine/form';
import { notifications } from '@mantine/notifications';
import { useState } from 'react';
import { isApiError } from '@/lib/api-client';
import { useCreateHoldRule } from '../api/create-hold-rule';
import { useQuantityChoices } from '../api/get-quantity-choices';
import type { HoldRuleKind, NewHoldRule, ProductChoice, RuleSet } from '../api/types';
import { KIND_LABELS } from '../holds-words';

interface AddRuleModalProps {
  opened: boolean;
  onClose: () => void;
  products: ProductChoice[];
  /** Product chosen on the page, preselected */
  productId: number | null;
}

interface FormValues {
  productId: string | null;
  kind: HoldRuleKind;
  windowUnits: number | string;
  minFpyPct: number | string;
  minCpk: number | string;
  quantityKey: string | null;
  ruleSet: RuleSet;
  failuresInRow: number | string;
}

const SEP = '\u001f';
const num = (v: number | string) => (typeof v === 'number' ? v : v === '' ? undefined : Number(v));

/** Adding a hold rule: the fields of the chosen kind; the server checks the bounds and the plan and names each problem. */
export function AddRuleModal({ opened, onClose, products, productId }: AddRuleModalProps) {
  const create = useCreateHoldRule();
  const [notice, setNotice] = useState<string | null>(null);
  const form = useForm<FormValues>({
    initialValues: { productId: productId ? String(productId) : null, kind: 'fpy', windowUnits: 50, minFpyPct: 92, minCpk: 1.33, quantityKey: null, ruleSet: 'western-electric', failuresInRow: 3 },
    validate: {
      productId: (v) => (v ? null : 'Choose the product the rule watches.'),
      quantityKey: (v, values) => ((values.kind === 'cpk' || values.kind === 'run_rule') && !v ? 'Choose the quantity to watch.' : null),
    },
  });
  const kind = form.values.kind;
  const chosenProduct = form.values.productId ? Number(form.values.productId) : null;
  const quantities = useQuantityChoices(kind === 'cpk' || kind === 'run_rule' ? chosenProduct : null);

  const close = () => {
    form.reset();
    setNotice(null);
    create.reset();
    onClose();
  };

  const submit = form.onSubmit((v) => {
    setNotice(null);
    const [stepKey, quantity] = v.quantityKey ? v.quantityKey.split(SEP) : [undefined, undefined];
    const body: NewHoldRule = { productId: Number(v.productId), kind: v.kind };
    if (v.kind !== 'consecutive_failures') body.windowUnits = num(v.windowUnits);
    if (v.kind === 'fpy') body.minFpyPct = num(v.minFpyPct);
    if (v.kind === 'cpk') body.minCpk = num(v.minCpk);
    if (v.kind === 'cpk' || v.kind === 'run_rule') Object.assign(body, { stepKey, quantity });
    if (v.kind === 'run_rule') body.ruleSet = v.ruleSet;
    if (v.kind === 'consecutive_failures') body.failuresInRow = num(v.failuresInRow);
    create.mutate(body, {
      onSuccess: (rule) => {
        notifications.show({ color: 'signalGreen', title: 'Hold rule added', message: `${rule.partNumber}: ${rule.description}` });
        close();
      },
      onError: (err) => {
        if (!isApiError(err)) return setNotice('The station server could not be reached; the rule was not added.');
        const problems = err.fieldProblems;
        for (const p of problems) form.setFieldError(p.field === 'stepKey' || p.field === 'quantity' ? 'quantityKey' : p.field, p.problems.join('; '));
        setNotice(problems.length > 0 ? 'Correct the marked fields.' : err.message);
      },
    });
  });

  const quantityData = (quantities.data ?? [])
    .filter((q) => kind !== 'cpk' || q.hasLimits)
    .map((q) => ({ value: `${q.stepKey}${SEP}${q.quantity}`, label: `${q.stepName} · ${q.name} (${q.unit})` }));

  return (
    <Modal opened={opened} onClose={close} title="Add a hold rule" size="lg">
      <form onSubmit={submit} noValidate>
        <Stack gap="md">
          <Select
            label="Product"
            required
            data={products.map((p) => ({ value: String(p.id), label: `${p.partNumber} · ${p.name}` }))}
            {...form.getInputProps('productId')}
          />
          <Select
            label="Hold the lot when"
            required
            allowDeselect={false}
            data={(Object.keys(KIND_LABELS) as HoldRuleKind[]).map((k) => ({ value: k, label: KIND_LABELS[k] }))}
            {...form.getInputProps('kind')}
          />
          {kind !== 'consecutive_failures' && (
            <NumberInput
              label={kind === 'fpy' ? 'Units looked at (N)' : 'Tests looked at (N)'}
              description={kind === 'fpy' ? 'The latest units of the lot, by their first test' : 'The latest tests of the lot'}
              min={1}
              allowDecimal={false}
              {...form.getInputProps('windowUnits')}
            />
          )}
          {kind === 'fpy' && <NumberInput label="Lowest acceptable first-pass yield (X, %)" min={0} max={100} decimalScale={2} {...form.getInputProps('minFpyPct')} />}
          {kind === 'cpk' && <NumberInput label="Lowest acceptable Cpk (Y)" min={0} decimalScale={2} step={0.01} {...form.getInputProps('minCpk')} />}
          {(kind === 'cpk' || kind === 'run_rule') && (
            <Select
              label="Quantity"
              description="From the product's released test plan"
              required
              searchable
              data={quantityData}
              nothingFoundMessage={chosenProduct ? 'No quantity in the released plan' : 'Choose a product first'}
              {...form.getInputProps('quantityKey')}
            />
          )}
          {kind === 'run_rule' && (
            <Select
              label="Run rules"
              allowDeselect={false}
              data={[
                { value: 'western-electric', label: 'Western Electric (4 rules)' },
                { value: 'nelson', label: 'Nelson (8 rules)' },
              ]}
              {...form.getInputProps('ruleSet')}
            />
          )}
          {kind === 'consecutive_failures' && <NumberInput label="Failed tests in a row (K)" min={1} allowDecimal={false} {...form.getInputProps('failuresInRow')} />}
          <Text size="sm" c="dimmed">
            The rule is checked after every finished test of this product. When it trips, the lot goes on hold and every quality user gets an e-mail.
          </Text>
          {notice && (
            <Alert color="signalRed" title="The rule was not added">
              {notice}
            </Alert>
          )}
          <Group justify="flex-end">
            <Button variant="default" onClick={close}>
              Cancel
            </Button>
            <Button type="submit" loading={create.isPending}>
              Add rule
            </Button>
          </Group>
        </Stack>
      </form>
    </Modal>
  );
}
