/** For the runs pages, which still import this path: the one fetch function lives in ../query/fetch. */
export { requestJson, apiJson, ApiRequestError, type ApiError, type ApiResult } from '../query/fetch';
