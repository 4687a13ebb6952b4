import { Card } from '../ui/card';
import { Caution } from '../ui/caution';
import { Screen } from '../ui/screen';
import { Text } from '../ui/text';

/** A home that exists before its screen is built out. */
export function PlaceholderScreen({ title, subtitle, body }: { title: string; subtitle: string; body: string }) {
  return (
    <Screen title={title} subtitle={subtitle}>
      <Card>
        <Text>{body}</Text>
      </Card>
      <Caution />
    </Screen>
  );
}
