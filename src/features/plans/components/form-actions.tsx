import { Button } from '@/components/ui/button';

export function FormActions({
  submit,
  onCancel,
  isLoading,
}: {
  submit: string;
  onCancel: () => void;
  isLoading?: boolean;
}) {
  return (
    <div className="flex justify-end gap-2 pt-2">
      <Button variant="secondary" onClick={onCancel}>
        Cancel
      </Button>
      <Button type="submit" isLoading={isLoading}>
        {submit}
      </Button>
    </div>
  );
}
