import { Alert, Button, Code, FileInput, Group, Modal, ScrollArea, Stack, Table, Text } from '@mantine/core';
import { IconFileTypeCsv } from '@tabler/icons-react';
import { useState } from 'react';
import { lotFileProblems, useImportLots } from '../api/lots-api';
import type { LotImportResult } from '../api/types';

interface ImportLotsModalProps {
  opened: boolean;
  onClose: () => void;
  onImported: (result: LotImportResult) => void;
}

/** "Import CSV": one lot per row; a refused file imports nothing and lists every bad row. */
export function ImportLotsModal({ opened, onClose, onImported }: ImportLotsModalProps) {
  const [file, setFile] = useState<File | null>(null);
  const upload = useImportLots();
  const problems = lotFileProblems(upload.error);

  const close = () => {
    upload.reset();
    setFile(null);
    onClose();
  };

  return (
    <Modal opened={opened} onClose={close} title="Import lots from a CSV file" size="xl">
      <Stack gap="sm">
        <Text size="sm">
          One lot per row, with the columns <Code>lot_code</Code>, <Code>product</Code> (part number), <Code>planned_quantity</Code>, and either{' '}
          <Code>first_serial</Code> + <Code>last_serial</Code> (a range) or <Code>serials</Code> (a list separated by spaces). A file with any bad row
          imports nothing. The lots list exports the same format.
        </Text>
        <FileInput
          label="Lot file"
          placeholder="Choose a .csv file"
          accept=".csv,text/csv"
          leftSection={<IconFileTypeCsv size={16} aria-hidden />}
          value={file}
          onChange={(f) => {
            upload.reset();
            setFile(f);
          }}
          clearable
        />
        {upload.isError && (
          <Alert color="signalRed" variant="light" role="alert" title="Nothing was imported">
            {upload.error.message}
          </Alert>
        )}
        {problems.length > 0 && (
          <ScrollArea.Autosize mah={320}>
            <Table aria-label="Problems in the file" striped verticalSpacing={4}>
              <Table.Thead>
                <Table.Tr>
                  <Table.Th>Row</Table.Th>
                  <Table.Th>Column</Table.Th>
                  <Table.Th>Problem</Table.Th>
                </Table.Tr>
              </Table.Thead>
              <Table.Tbody>
                {problems.map((p, i) => (
                  <Table.Tr key={i}>
                    <Table.Td ff="monospace">{p.row}</Table.Td>
                    <Table.Td ff="monospace">{p.column}</Table.Td>
                    <Table.Td>{p.message}</Table.Td>
                  </Table.Tr>
                ))}
              </Table.Tbody>
            </Table>
          </ScrollArea.Autosize>
        )}
        <Group justify="flex-end">
          <Button variant="default" onClick={close}>
            Cancel
          </Button>
          <Button
            disabled={!file}
            loading={upload.isPending}
            onClick={() =>
              file &&
              upload.mutate(file, {
                onSuccess: (r) => {
                  onImported(r);
                  close();
                },
              })
            }
          >
            Import
          </Button>
        </Group>
      </Stack>
    </Modal>
  );
}
