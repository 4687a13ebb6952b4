import { ReadingsImportScreen } from '@/components/readings-import/readings-import-screen';

export default function ReadingsImportRoute() {
  return <ReadingsImportScreen />;
}
