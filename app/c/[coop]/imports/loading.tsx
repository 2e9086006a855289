export { PageLoading as default } from '@/components/shell/page-loading';
