import { Alert, Button, FileInput, Group, List, Select, Stack, Text, TextInput } from '@mantine/core';
import { IconAlertCircle, IconUpload } from '@tabler/icons-react';
import { useState, type FormEvent } from 'react';
import { fileProblems, usePlanChoices, useUpload } from '../api/characterization-api';
import type { DataSetSummary } from '../api/types';
import { problemText } from './characterization-format';

/** Upload of a pilot build's CSV; a refused file's problems are listed one per line. */
export function UploadPanel({ onUploaded }: { onUploaded: (d: DataSetSummary) => void }) {
  const [file, setFile] = useState<File | null>(null);
  const [name, setName] = useState('');
  const [product, setProduct] = useState<string | null>(null);
  const [missing, setMissing] = useState<string | null>(null);
  const upload = useUpload();
  const plans = usePlanChoices();
  const products = [...new Map((plans.data ?? []).map((p) => [p.product.partNumber, p.product])).values()].map((p) => ({ value: p.partNumber, label: `${p.partNumber} — ${p.name}` }));
  const problems = fileProblems(upload.error);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!file) return setMissing('Choose the CSV file first.');
    if (name.trim().length < 3) return setMissing('Give the data set a name of at least 3 characters.');
    setMissing(null);
    upload.mutate(
      { file, name: name.trim(), product },
      {
        onSuccess: (d) => {
          setFile(null);
          setName('');
          setProduct(null);
          onUploaded(d);
        },
      },
    );
  };

  return (
    <form onSubmit={submit} aria-label="Upload characterization data">
      <Stack gap="sm">
        <FileInput
          label="CSV file"
          description="First column serial, then one column per quantity with its unit, e.g. vout_V (docs/characterization-data.md)"
          placeholder="Choose a .csv file"
          accept=".csv,text/csv"
          value={file}
          onChange={(f) => {
            setFile(f);
            if (f && !name) setName(f.name.replace(/\.csv$/i, ''));
            upload.reset();
          }}
          clearable
        />
        <Group grow align="flex-start">
          <TextInput label="Name of the data set" placeholder="OB-BK0503 pilot build P2" value={name} onChange={(e) => setName(e.currentTarget.value)} />
          <Select label="Product (optional)" placeholder="Not stated" data={products} value={product} onChange={setProduct} clearable />
        </Group>
        {missing && (
          <Text c="signalRed.8" size="sm" role="alert">
            {missing}
          </Text>
        )}
        {upload.isError && (
          <Alert color="signalRed" variant="light" icon={<IconAlertCircle aria-hidden />} title="The file was not stored" role="alert">
            {problems.length > 0 ? (
              <List size="sm" spacing={2} aria-label="Problems in the file">
                {problems.map((p, i) => (
                  <List.Item key={i}>{problemText(p)}</List.Item>
                ))}
              </List>
            ) : (
              upload.error.message
            )}
            <Text size="xs" c="dimmed" mt={6}>
              Nothing was stored. Correct the file and upload it again.
            </Text>
          </Alert>
        )}
        <Group>
          <Button type="submit" leftSection={<IconUpload size={16} aria-hidden />} loading={upload.isPending}>
            Upload
          </Button>
        </Group>
      </Stack>
    </form>
  );
}
