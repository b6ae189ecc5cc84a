import { Alert, Paper, Text, Title } from '@mantine/core';
import { IconClockExclamation } from '@tabler/icons-react';
import { BrandMark } from '@/components/layout/brand-mark';
import type { AuthUser } from '@/lib/auth';
import { SignInForm } from './sign-in-form';
import classes from './sign-in-page.module.css';

interface SignInPageProps {
  onSignedIn: (user: AuthUser) => void;
  /** Shown above the form when people were sent here because their session ended */
  notice?: string;
}

export function SignInPage({ onSignedIn, notice }: SignInPageProps) {
  return (
    <main className={classes.page}>
      <Paper className={classes.card} withBorder shadow="md" radius="md" p="xl">
        <div className={classes.brand}>
          <BrandMark size={40} />
          <span className={classes.brandName}>Railwright</span>
        </div>
        <Title order={1} fz={24} mb={4}>
          Sign in
        </Title>
        <Text c="dimmed" mb="lg">
          End-of-line test for DC-DC modules. Use the user name your supervisor gave you.
        </Text>
        {notice && (
          <Alert color="copper" variant="light" mb="md" role="status" icon={<IconClockExclamation aria-hidden />}>
            {notice}
          </Alert>
        )}
        <SignInForm onSignedIn={onSignedIn} />
      </Paper>
    </main>
  );
}
