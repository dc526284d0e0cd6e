import { Body, Controller, Get, Param, Patch, Post, Query } from '@nestjs/common';
import { uuidParam } from '../common/http/uuid-param';
import { ApiCreatedResponse, ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import {
  CreateStaffUserDto,
  ListUsersQueryDto,
  StaffUserDto,
  StaffUserPageDto,
  UpdateStaffUserDto,
} from './dto/user.dto';
import { UsersService } from './users.service';

@ApiTags('staff')
@Roles('admin')
@Controller('users')
export class UsersController {
  constructor(private readonly users: UsersService) {}

  @Get()
  @ApiOkResponse({ type: StaffUserPageDto })
  list(@Query() query: ListUsersQueryDto): Promise<StaffUserPageDto> {
    return this.users.listStaff(query);
  }

  @Get(':id')
  @ApiOkResponse({ type: StaffUserDto })
  get(@Param('id', uuidParam('id')) id: string): Promise<StaffUserDto> {
    return this.users.getStaff(id);
  }

  @Post()
  @ApiCreatedResponse({ type: StaffUserDto })
  create(@CurrentUser() actor: SessionUser, @Body() body: CreateStaffUserDto): Promise<StaffUserDto> {
    return this.users.createStaff(actor, body);
  }

  @Patch(':id')
  @ApiOkResponse({ type: StaffUserDto })
  update(
    @CurrentUser() actor: SessionUser,
    @Param('id', uuidParam('id')) id: string,
    @Body() body: UpdateStaffUserDto,
  ): Promise<StaffUserDto> {
    return this.users.updateStaff(actor, id, body);
  }
}
