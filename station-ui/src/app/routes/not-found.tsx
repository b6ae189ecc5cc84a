import { Button, Paper, Text, Title } from '@mantine/core';
import { Link, useLocation } from 'react-router-dom';
import { paths } from '@/config/paths';

export default function NotFoundRoute() {
  const { pathname } = useLocation();
  return (
    <Paper withBorder p="xl" radius="md" maw={640}>
      <Title order={1} fz={26}>
        No page at this address
      </Title>
      <Text mt="xs">
        Railwright has nothing at <Text span ff="monospace">{pathname}</Text>. The link may be old or mistyped.
      </Text>
      <Button component={Link} to={paths.home.href()} mt="lg">
        Go to my start page
      </Button>
    </Paper>
  );
}
