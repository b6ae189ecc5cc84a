import { Paper, Text, ThemeIcon } from '@mantine/core';
import { IconTool } from '@tabler/icons-react';
import { PageHeader } from './page-header';

interface PlaceholderPageProps {
  title: string;
  /** What the page will be for, in a sentence */
  purpose: string;
}

/** Stands in for a screen another part of the project has not delivered yet. */
export function PlaceholderPage({ title, purpose }: PlaceholderPageProps) {
  return (
    <>
      <PageHeader title={title} description={purpose} />
      <Paper withBorder p="xl" radius="md" maw={640}>
        <ThemeIcon size={44} radius="md" variant="light" color="copper" mb="md">
          <IconTool size={26} aria-hidden />
        </ThemeIcon>
        <Text fw={700} size="lg">
          This screen is still being built.
        </Text>
        <Text c="dimmed" mt={4}>
          It will arrive with a later release of Railwright. Nothing is missing from your data in the meantime.
        </Text>
      </Paper>
    </>
  );
}
