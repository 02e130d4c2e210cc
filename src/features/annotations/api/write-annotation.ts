import type {
  Annotation,
  AnnotationAttachment,
  CreateAnnotationInput,
  CreateReplyInput,
  UpdateAnnotationInput,
} from '@shared/schemas/annotations';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { annotationKeys } from './keys';

export function createAnnotation({
  stationId,
  data,
}: {
  stationId: number;
  data: CreateAnnotationInput;
}): Promise<Annotation> {
  return api.post(`/stations/${stationId}/annotations`, data);
}

export function addReply({ id, data }: { id: number; data: CreateReplyInput }): Promise<Annotation> {
  return api.post(`/annotations/${id}/replies`, data);
}

export function updateAnnotation({
  id,
  data,
}: {
  id: number;
  data: UpdateAnnotationInput;
}): Promise<Annotation> {
  return api.patch(`/annotations/${id}`, data);
}

export async function uploadAttachment({
  id,
  file,
}: {
  id: number;
  file: File;
}): Promise<AnnotationAttachment> {
  const form = new FormData();
  form.append('file', file);
  const { attachment } = await api.post<{ attachment: AnnotationAttachment }>(
    `/annotations/${id}/attachments`,
    form,
  );
  return attachment;
}

/** Every annotation write makes the station's list stale; the caller's onSuccess still runs. */
function useAnnotationWrite<TData, TVariables>(
  mutationFn: (variables: TVariables) => Promise<TData>,
  onSuccess?: (data: TData, variables: TVariables) => void,
) {
  return useInvalidatingMutation({ mutationFn, invalidates: [annotationKeys.lists()], onSuccess });
}

export const useCreateAnnotation = ({ onSuccess }: { onSuccess?: (a: Annotation) => void } = {}) =>
  useAnnotationWrite(createAnnotation, onSuccess);

export const useAddReply = ({ onSuccess }: { onSuccess?: (a: Annotation) => void } = {}) =>
  useAnnotationWrite(addReply, onSuccess);

export const useUpdateAnnotation = ({ onSuccess }: { onSuccess?: (a: Annotation) => void } = {}) =>
  useAnnotationWrite(updateAnnotation, onSuccess);

export const useUploadAttachment = ({ onSuccess }: { onSuccess?: (a: AnnotationAttachment) => void } = {}) =>
  useAnnotationWrite(uploadAttachment, onSuccess);
