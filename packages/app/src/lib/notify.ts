/**
 * Toasts, imported explicitly (not as auto-imported globals) with their own CSS, since
 * on-demand Element Plus only brings styles for what is imported. Views call these; the API
 * client never does.
 */
import { ElMessage } from 'element-plus/es';
import 'element-plus/es/components/message/style/css';

// Bottom right: page headers (names, revisions, hashes) stay readable while a toast shows.
export function notifySuccess(message: string): void {
  ElMessage({ type: 'success', message, duration: 2500, placement: 'bottom-right' });
}

export function notifyError(message: string): void {
  ElMessage({ type: 'error', message, duration: 6000, showClose: true, placement: 'bottom-right' });
}
